import { createEngineStates, findLifeLeft, type EngineState } from "./engine-state";
import { describeAltitudeWarning, describeAssignment, type AssignmentReason } from "./explain";
import type { NormEntry, NormEvent, NormInput } from "./normalize-input";
import { buildShopDays, type DayLabour, type ShopDays } from "./shop-capacity";
import { formatDayNumber } from "./day-math";
import { buildPoolOutlooks, type PoolKey, type PoolOutlook } from "./plan-season-end";
import type { JobKind, PlanConflict, PlanExplanation, PlannedJob, PlanWarning, WatchPoint } from "./types";

// Everything one planning run accumulates, and the one place an entry gets its engine, so the
// chassis map, counters, warnings and explanations can never disagree with the assignments.

/** A job with the labour it holds and the days it may move within. */
export interface JobBooking {
  job: PlannedJob;
  engineName: string;
  booked: DayLabour[];
  windowStartDay: number;
  windowEndDay: number;
  movable: boolean;
}

export interface PlanContext {
  norm: NormInput;
  shop: ShopDays;
  engines: EngineState[];
  /** Which engine sits in each chassis right now. */
  chassisEngine: Map<string, number>;
  /** The last event (sorted index) each chassis is entered in. */
  lastEntryEventIndex: Map<string, number>;
  /** Smallest positive usage of any entry from this event on (dead life is below it). */
  smallestUsageFrom: Float64Array;
  assignments: Record<string, string>;
  usageLeftAfter: Record<string, number>;
  bookings: JobBooking[];
  conflicts: PlanConflict[];
  warnings: PlanWarning[];
  explanations: PlanExplanation[];
  watchPoints: WatchPoint[];
  engineMoves: number;
  outlooks: Map<PoolKey, PoolOutlook>;
}

export function createPlanContext(norm: NormInput): PlanContext {
  const engines = createEngineStates(norm);
  const chassisEngine = new Map<string, number>();
  for (const e of engines) if (e.chassisId !== null) chassisEngine.set(e.chassisId, e.norm.index);
  const lastEntryEventIndex = new Map<string, number>();
  norm.events.forEach((event, k) => {
    for (const entry of event.entries) lastEntryEventIndex.set(entry.chassisId, k);
  });
  norm.events.forEach((event) => {
    if (!event.inScope) return;
    for (const entry of event.entries) {
      const pinned = norm.entryPins.get(entry.entryId);
      if (pinned !== undefined) {
        engines[pinned].pinnedRuns.push({ entryId: entry.entryId, startDay: event.startDay, endDay: event.endDay });
      }
    }
  });
  const smallestUsageFrom = new Float64Array(norm.events.length + 1).fill(Infinity);
  for (let k = norm.events.length - 1; k >= 0; k--) {
    let least = smallestUsageFrom[k + 1];
    for (const entry of norm.events[k].entries) if (entry.usage > 0 && entry.usage < least) least = entry.usage;
    smallestUsageFrom[k] = least;
  }
  return {
    norm,
    shop: buildShopDays(norm),
    engines,
    chassisEngine,
    lastEntryEventIndex,
    smallestUsageFrom,
    assignments: {},
    usageLeftAfter: {},
    bookings: [],
    conflicts: [],
    warnings: [],
    explanations: [],
    watchPoints: [],
    engineMoves: 0,
    outlooks: buildPoolOutlooks(norm, engines),
  };
}

export interface AssignmentChoice {
  reason: AssignmentReason;
  jobKind: JobKind | null;
  /** Life left before the event, measured before any job on the way. */
  lifeLeftBefore: number;
}

/** Seats the engine in the entry's chassis, runs the event on it and records why. */
export function assignEngine(ctx: PlanContext, eventIndex: number, entry: NormEntry, state: EngineState, choice: AssignmentChoice): void {
  const event = ctx.norm.events[eventIndex];
  const fromChassisId = state.chassisId !== entry.chassisId ? state.chassisId : null;
  const ownIndex = ctx.chassisEngine.get(entry.chassisId);
  const displaced = ownIndex !== undefined && ownIndex !== state.norm.index ? ctx.engines[ownIndex] : null;
  if (state.chassisId !== entry.chassisId) {
    ctx.engineMoves += 1;
    if (state.chassisId !== null && ctx.chassisEngine.get(state.chassisId) === state.norm.index) {
      ctx.chassisEngine.delete(state.chassisId);
    }
    if (displaced) displaced.chassisId = null;
    ctx.chassisEngine.set(entry.chassisId, state.norm.index);
    state.chassisId = entry.chassisId;
  }
  ctx.assignments[entry.entryId] = state.norm.id;
  state.takenAtEvent = eventIndex;
  recordExplanation(ctx, event, entry, state, choice, fromChassisId, displaced);
  recordAltitude(ctx, event, entry, state);
  runEvent(ctx, event, entry, state);
}

function recordExplanation(ctx: PlanContext, event: NormEvent, entry: NormEntry, state: EngineState, choice: AssignmentChoice, fromChassisId: string | null, displaced: EngineState | null): void {
  ctx.explanations.push({
    subject: "entry",
    subjectId: entry.entryId,
    engineId: state.norm.id,
    text: describeAssignment({
      reason: choice.reason,
      engineName: state.norm.name,
      chassisId: entry.chassisId,
      event,
      usage: entry.usage,
      unit: ctx.norm.usageUnit,
      lifeLeftBefore: choice.lifeLeftBefore,
      fromChassisId,
      displacedEngineName: displaced ? displaced.norm.name : null,
      displacedLifeLeft: displaced ? findLifeLeft(displaced) : null,
      jobKind: choice.jobKind ?? (state.lastJob?.forEventId === event.id ? state.lastJob.kind : null),
    }),
  });
}

function recordAltitude(ctx: PlanContext, event: NormEvent, entry: NormEntry, state: EngineState): void {
  const min = state.norm.minElevationM;
  if (min === null || event.elevationM >= min) return;
  ctx.warnings.push({
    kind: "altitude",
    entryId: entry.entryId,
    engineId: state.norm.id,
    eventId: event.id,
    message: describeAltitudeWarning(state.norm.name, min, event, event.elevationM),
  });
}

function runEvent(ctx: PlanContext, event: NormEvent, entry: NormEntry, state: EngineState): void {
  const counters = state.norm.counters;
  for (let c = 0; c < counters.length; c++) {
    const before = state.used[c];
    const after = before + entry.usage;
    state.used[c] = after;
    const watch = counters[c].limit * state.norm.planFraction;
    if (before < watch && after >= watch) {
      ctx.watchPoints.push({
        engineId: state.norm.id,
        kind: counters[c].kind,
        counter: counters[c].label,
        date: formatDayNumber(event.endDay),
        usageAfter: after,
        limit: counters[c].limit,
      });
    }
  }
  state.busyUntil = Math.max(state.busyUntil, event.endDay);
  ctx.usageLeftAfter[entry.entryId] = Math.round(findLifeLeft(state) * 1000) / 1000;
}
