import {
  applyPinnedJobsBefore,
  chooseJobKinds,
  coversUsage,
  findLifeLeft,
  findWastedLife,
  isBlockedByPins,
  type EngineState,
} from "./engine-state";
import {
  describeJobReason,
  describeNoFreeEngine,
  describeShortfall,
  describeUsageOverLimit,
  formatAmount,
  nameJobKind,
} from "./explain";
import { computeLowerBoundFromNorm } from "./lower-bound";
import { normalizePlannerInput, type NormEntry, type NormEvent } from "./normalize-input";
import { assignEngine, createPlanContext, type PlanContext } from "./plan-context";
import { placePinnedJobs, settleJobs, tryBookJob, type JobAttempt } from "./plan-jobs";
import { findClosingRunners, findPoolKey, renewForClosingStretch, type ClosingRunners } from "./plan-season-end";
import { CoveringPool } from "./select-engine";
import type { JobKind, PlannerInput, RebuildPlan } from "./types";

// The rebuild planner. Events are planned earliest first; in each event the entries get, in
// this order: (1) their pinned engine; (2) the engine already in their chassis if it has the
// life; (3) the free engine with the least life that still covers (the freshest one at an
// important event); (4) only then an engine that needs a job, fitted into free shop hours
// before the event (and at the end slid as late as the shop allows).
// Using existing life before any rebuild, and rebuilding the engine whose usable life the job
// throws away least, is what keeps the rebuild count near the lower bound; near the end of the
// season plan-season-end.ts adjusts steps 2–3 and adds early renewals.

function compareEntries(a: NormEntry, b: NormEntry): number {
  return b.usage - a.usage || (a.entryId < b.entryId ? -1 : a.entryId > b.entryId ? 1 : 0);
}

function isFreeFor(state: EngineState, event: NormEvent, eventIndex: number, entryId: string | null): boolean {
  if (state.norm.retired || state.takenAtEvent === eventIndex) return false;
  if (state.norm.availableFromDay > event.startDay || state.busyUntil >= event.startDay) return false;
  applyPinnedJobsBefore(state, event.startDay);
  if (state.busyUntil >= event.startDay) return false;
  return !isBlockedByPins(state, event.startDay, event.endDay, entryId);
}

function describeTightest(state: EngineState): { label: string; used: number; limit: number } {
  let best = 0;
  state.norm.counters.forEach((c, i) => {
    if (c.limit - state.used[i] < state.norm.counters[best].limit - state.used[best]) best = i;
  });
  const c = state.norm.counters[best];
  return { label: c.label, used: state.used[best], limit: c.limit };
}

/** Books the job an engine needs for an entry and seats it; returns the failed attempt if not. */
function rebuildAndAssign(ctx: PlanContext, k: number, entry: NormEntry, state: EngineState, kinds: JobKind[], pinned: boolean): JobAttempt {
  const event = ctx.norm.events[k];
  const lifeLeftBefore = findLifeLeft(state);
  const tight = describeTightest(state);
  const attempt = tryBookJob(ctx, state, kinds, event, (kind) =>
    describeJobReason({
      kind,
      engineName: state.norm.name,
      unit: ctx.norm.usageUnit,
      counterLabel: tight.label,
      counterUsed: tight.used,
      counterLimit: tight.limit,
      chassisId: entry.chassisId,
      event,
      usage: entry.usage,
      upgraded: kind === "bottomEnd" && kinds.length > 1,
    }),
  );
  if (attempt.ok) {
    assignEngine(ctx, k, entry, state, { reason: pinned ? "pinned" : "rebuilt", jobKind: attempt.kind, lifeLeftBefore });
  }
  return attempt;
}

function planPinnedEntry(ctx: PlanContext, k: number, entry: NormEntry, engineIndex: number): void {
  const event = ctx.norm.events[k];
  const state = ctx.engines[engineIndex];
  const what = `the pin of ${state.norm.name} to chassis ${entry.chassisId} at the ${event.name} event cannot hold`;
  const fail = (message: string): void => {
    ctx.conflicts.push({ kind: "entryPin", entryId: entry.entryId, engineId: state.norm.id, eventId: event.id, message });
  };
  if (state.norm.retired) return fail(`${what}: the engine is retired`);
  if (!fitsFamily(state, entry)) return fail(`${what}: the chassis takes a ${entry.family} engine and ${state.norm.name} is not one`);
  if (!isFreeFor(state, event, k, entry.entryId)) {
    return fail(`${what}: the engine is in another entry, on the bench or not yet available then`);
  }
  if (coversUsage(state, entry.usage)) {
    assignEngine(ctx, k, entry, state, { reason: "pinned", jobKind: null, lifeLeftBefore: findLifeLeft(state) });
    return;
  }
  const kinds = chooseJobKinds(state, entry.usage);
  if (kinds === null || kinds.length === 0) {
    return fail(`${what}: ${formatAmount(entry.usage)} ${ctx.norm.usageUnit} is more than the engine's limits allow`);
  }
  const attempt = rebuildAndAssign(ctx, k, entry, state, kinds, true);
  if (!attempt.ok) {
    fail(`${what}: it has ${formatAmount(Math.max(0, findLifeLeft(state)))} ${ctx.norm.usageUnit} left, the ${nameJobKind(attempt.kind)} needs ${formatAmount(attempt.labourCenti / 100)} h and the shop has ${formatAmount(attempt.freeCenti / 100)} h free before the event`);
  }
}

interface RebuildCandidate {
  state: EngineState;
  kinds: JobKind[];
  rank: number[];
}

function rankRebuildCandidates(ctx: PlanContext, k: number, free: EngineState[], usage: number): RebuildCandidate[] {
  const event = ctx.norm.events[k];
  const ahead = ctx.smallestUsageFrom[k];
  const list: RebuildCandidate[] = [];
  for (const state of free) {
    const kinds = chooseJobKinds(state, usage);
    if (kinds === null || kinds.length === 0) continue;
    const steals = isNeededElsewhere(ctx, state, k) ? 1 : 0;
    const altitude = state.norm.minElevationM !== null && event.elevationM < state.norm.minElevationM ? 1 : 0;
    const waste = findWastedLife(state, kinds[kinds.length - 1], ahead);
    list.push({ state, kinds, rank: [waste, steals, altitude, state.norm.labourCenti[kinds[0]]] });
  }
  return list.sort((a, b) => {
    for (let i = 0; i < a.rank.length; i++) if (a.rank[i] !== b.rank[i]) return a.rank[i] - b.rank[i];
    return a.state.norm.id < b.state.norm.id ? -1 : 1;
  });
}

function isNeededElsewhere(ctx: PlanContext, state: EngineState, k: number): boolean {
  return state.chassisId !== null && (ctx.lastEntryEventIndex.get(state.chassisId) ?? -1) >= k;
}

function planRebuildEntry(ctx: PlanContext, k: number, entry: NormEntry, free: EngineState[], ranked: RebuildCandidate[]): void {
  const event = ctx.norm.events[k];
  const own = ctx.chassisEngine.get(entry.chassisId);
  const order = ranked.filter((c) => c.state.takenAtEvent !== k);
  const ownAt = order.findIndex((c) => c.state.norm.index === own);
  // The chassis's own engine goes first when its job wastes no more usable life than the best.
  if (ownAt > 0 && order[ownAt].rank[0] <= order[0].rank[0]) order.unshift(...order.splice(ownAt, 1));
  let best: Extract<JobAttempt, { ok: false }> | null = null;
  for (const candidate of order) {
    const attempt = rebuildAndAssign(ctx, k, entry, candidate.state, candidate.kinds, false);
    if (attempt.ok) return;
    if (!best || attempt.freeCenti > best.freeCenti) best = attempt;
  }
  const usable = free.filter((s) => s.takenAtEvent !== k);
  let message: string;
  let kind: "noEngine" | "usageOverLimit" | "shopCapacity";
  if (best) {
    kind = "shopCapacity";
    message = describeShortfall({
      chassisId: entry.chassisId,
      event,
      usage: entry.usage,
      unit: ctx.norm.usageUnit,
      freeHours: best.freeCenti / 100,
      jobKind: best.kind,
      jobHours: best.labourCenti / 100,
      partsReadyDay: best.partsReadyDay,
    });
  } else if (usable.length > 0) {
    kind = "usageOverLimit";
    const largest = Math.max(...usable.map((s) => Math.min(...s.norm.counters.map((c) => c.limit))));
    message = describeUsageOverLimit(entry.chassisId, event, entry.usage, ctx.norm.usageUnit, largest);
  } else {
    kind = "noEngine";
    message = describeNoFreeEngine(entry.chassisId, event, ctx.engines.filter((s) => !s.norm.retired && fitsFamily(s, entry)).length);
  }
  ctx.conflicts.push({ kind, entryId: entry.entryId, eventId: event.id, message });
}

function fitsFamily(state: EngineState, entry: NormEntry): boolean {
  return entry.family === null || state.norm.family === entry.family;
}

/** Step 2: entries whose chassis already holds an engine with the life keep it. */
function seatOwnEngines(ctx: PlanContext, k: number, open: NormEntry[], free: EngineState[], closing: ClosingRunners): NormEntry[] {
  const isFree = new Uint8Array(ctx.engines.length);
  for (const s of free) isFree[s.norm.index] = 1;
  const left: NormEntry[] = [];
  for (const entry of open) {
    const own = ctx.chassisEngine.get(entry.chassisId);
    const state = own === undefined ? undefined : ctx.engines[own];
    const runners = closing.get(findPoolKey(entry.family));
    const mayStay = runners === undefined || runners === null || (state !== undefined && runners.has(state.norm.index));
    if (state && isFree[state.norm.index] === 1 && state.takenAtEvent !== k && fitsFamily(state, entry) && coversUsage(state, entry.usage) && mayStay) {
      assignEngine(ctx, k, entry, state, { reason: "kept", jobKind: null, lifeLeftBefore: findLifeLeft(state) });
    } else left.push(entry);
  }
  return left;
}

/** Step 3: a free engine that already has the life, by tier and fit (see CoveringPool). */
function fitCoveringEngines(ctx: PlanContext, k: number, entries: NormEntry[], free: EngineState[], closing: ClosingRunners): NormEntry[] {
  const event = ctx.norm.events[k];
  const pools = new Map<string, CoveringPool>();
  const tierOf = (s: EngineState): number =>
    (isNeededElsewhere(ctx, s, k) ? 2 : 0) + (s.norm.minElevationM !== null && event.elevationM < s.norm.minElevationM ? 1 : 0);
  const left: NormEntry[] = [];
  for (const entry of entries) {
    const key = entry.family ?? "";
    let pool = pools.get(key);
    if (!pool) {
      pool = new CoveringPool(entry.family === null ? free : free.filter((s) => s.norm.family === entry.family), 4, tierOf);
      pools.set(key, pool);
    }
    const spread = closing.has(findPoolKey(entry.family));
    const state = pool.take(entry.usage, event.important || spread, k);
    if (!state) {
      left.push(entry);
      continue;
    }
    const reason = event.important ? "fresh" : spread ? "spread" : "fitted";
    assignEngine(ctx, k, entry, state, { reason, jobKind: null, lifeLeftBefore: findLifeLeft(state) });
  }
  return left;
}

/** Step 4: an engine that needs a job first, or a conflict that says why none can run. */
function rebuildForEntries(ctx: PlanContext, k: number, entries: NormEntry[], free: EngineState[]): void {
  const fitting = new Map<string, EngineState[]>();
  const rankedBy = new Map<string, RebuildCandidate[]>();
  for (const entry of entries) {
    const family = entry.family ?? "";
    let members = fitting.get(family);
    if (!members) {
      members = free.filter((s) => fitsFamily(s, entry));
      fitting.set(family, members);
    }
    const key = `${entry.usage}|${family}`;
    let ranked = rankedBy.get(key);
    if (!ranked) {
      ranked = rankRebuildCandidates(ctx, k, members, entry.usage);
      rankedBy.set(key, ranked);
    }
    planRebuildEntry(ctx, k, entry, members, ranked);
  }
}

/** Renewals for the closing stretch come last: they must never take shop hours from an entry. */
function renewAfterEvent(ctx: PlanContext, k: number, free: EngineState[], closing: ClosingRunners): void {
  const next = findNextPlannedEvent(ctx, k);
  if (next === null) return;
  const nextEvent = ctx.norm.events[next];
  for (const key of [...closing.keys()].sort()) {
    const outlook = ctx.outlooks.get(key);
    const candidates = free.filter((s) => s.takenAtEvent !== k && isFreeFor(s, nextEvent, next, null));
    if (outlook) renewForClosingStretch(ctx, next, key, outlook, candidates);
  }
}

function planEvent(ctx: PlanContext, k: number): void {
  const event = ctx.norm.events[k];
  const open: NormEntry[] = [];
  for (const entry of [...event.entries].sort(compareEntries)) {
    const pinned = ctx.norm.entryPins.get(entry.entryId);
    if (pinned !== undefined) planPinnedEntry(ctx, k, entry, pinned);
    else open.push(entry);
  }
  const free = ctx.engines.filter((s) => isFreeFor(s, event, k, null));
  const closing = findClosingRunners(ctx, k, open, free);
  const afterOwn = seatOwnEngines(ctx, k, open, free, closing);
  const stillFree = free.filter((s) => s.takenAtEvent !== k);
  const needJob = fitCoveringEngines(ctx, k, afterOwn, stillFree, closing);
  rebuildForEntries(ctx, k, needJob, stillFree);
  renewAfterEvent(ctx, k, stillFree, closing);
}

function findNextPlannedEvent(ctx: PlanContext, k: number): number | null {
  for (let j = k + 1; j < ctx.norm.events.length; j++) if (ctx.norm.events[j].inScope) return j;
  return null;
}

/** Plans the season from `input.today`: engines for entries, jobs in the shop, conflicts. */
export function planRebuilds(input: PlannerInput): RebuildPlan {
  const norm = normalizePlannerInput(input);
  const ctx = createPlanContext(norm);
  placePinnedJobs(ctx);
  norm.events.forEach((event, k) => {
    if (event.inScope) planEvent(ctx, k);
  });
  const jobs = settleJobs(ctx);
  const entryCount = norm.events.reduce((n, e) => n + (e.inScope ? e.entries.length : 0), 0);
  return {
    assignments: ctx.assignments,
    usageLeftAfter: ctx.usageLeftAfter,
    jobs,
    conflicts: ctx.conflicts,
    warnings: ctx.warnings,
    explanations: ctx.explanations,
    watchPoints: ctx.watchPoints,
    stats: {
      entryCount,
      assignedCount: Object.keys(ctx.assignments).length,
      conflictCount: ctx.conflicts.length,
      rebuildCount: jobs.filter((j) => j.kind !== "inspection").length,
      inspectionCount: jobs.filter((j) => j.kind === "inspection").length,
      lowerBound: computeLowerBoundFromNorm(norm).rebuilds,
      engineMoves: ctx.engineMoves,
    },
  };
}
