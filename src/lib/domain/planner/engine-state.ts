import { JOB_RESETS, type JobKind } from "./types";
import type { NormEngine, NormInput } from "./normalize-input";

// The running state of one engine while the season is planned event by event: how much of each
// counter is used, until which day it is busy, which chassis it sits in.

/** Decimal usages (0.8 + 0.8 + 0.8) must not trip a limit they sit exactly on. */
export const USAGE_EPSILON = 1e-9;

export interface PinnedJobSlot {
  kind: JobKind;
  startDay: number;
  endDay: number;
  applied: boolean;
}

/** The days of a pinned entry's event, kept free of any other entry for that engine. */
export interface PinnedRun {
  entryId: string;
  startDay: number;
  endDay: number;
}

export interface EngineState {
  norm: NormEngine;
  used: Float64Array;
  /** Last day taken by an event the engine ran or a job on it. */
  busyUntil: number;
  chassisId: string | null;
  pinnedJobs: PinnedJobSlot[];
  pinnedRuns: PinnedRun[];
  /** Index of the event the engine was last taken for (one entry per event). */
  takenAtEvent: number;
  /** The last planned job: its kind and the event it readies the engine for. */
  lastJob: { kind: JobKind; forEventId: string } | null;
}

export function createEngineStates(norm: NormInput): EngineState[] {
  return norm.engines.map((e) => ({
    norm: e,
    used: Float64Array.from(e.counters.map((c) => c.used)),
    busyUntil: Number.MIN_SAFE_INTEGER,
    chassisId: e.retired ? null : e.chassisId,
    pinnedJobs: [],
    pinnedRuns: [],
    takenAtEvent: -1,
    lastJob: null,
  }));
}

/** Life left on the tightest counter; negative when a counter is already past its limit. */
export function findLifeLeft(state: EngineState): number {
  let least = Infinity;
  const counters = state.norm.counters;
  for (let c = 0; c < counters.length; c++) {
    const left = counters[c].limit - state.used[c];
    if (left < least) least = left;
  }
  return least;
}

/** Life left on the counters of one kind (Infinity when the engine has none of that kind). */
export function findLifeLeftOfKind(state: EngineState, kind: JobKind): number {
  let least = Infinity;
  const counters = state.norm.counters;
  for (let c = 0; c < counters.length; c++) {
    if (counters[c].kind === kind) least = Math.min(least, counters[c].limit - state.used[c]);
  }
  return least;
}

export function coversUsage(state: EngineState, usage: number): boolean {
  return findLifeLeft(state) + USAGE_EPSILON >= usage;
}

/**
 * The jobs that would let the engine take `usage`, best first; an empty list when it already
 * can, null when even a fresh engine could not (a limit smaller than the usage).
 * The smallest job that renews every short counter comes first, except that a top end whose
 * next life would be cut short by the bottom end becomes a bottom end: one job instead of two.
 */
export function chooseJobKinds(state: EngineState, usage: number): JobKind[] | null {
  const counters = state.norm.counters;
  let shortTop = false;
  let shortBottom = false;
  let shortInspection = false;
  for (let c = 0; c < counters.length; c++) {
    if (state.used[c] + usage <= counters[c].limit + USAGE_EPSILON) continue;
    if (counters[c].kind === "topEnd") shortTop = true;
    else if (counters[c].kind === "bottomEnd") shortBottom = true;
    else shortInspection = true;
  }
  if (!shortTop && !shortBottom && !shortInspection) return [];
  const minimal: JobKind = shortBottom ? "bottomEnd" : shortTop ? "topEnd" : "inspection";
  const kinds: JobKind[] = [];
  if (minimal === "topEnd") {
    const bottomLeft = findLifeLeftOfKind(state, "bottomEnd");
    const freshTop = Math.min(
      ...counters.filter((c) => JOB_RESETS.topEnd.includes(c.kind)).map((c) => c.limit),
    );
    if (bottomLeft < freshTop && isJobEnough(state, "bottomEnd", usage)) kinds.push("bottomEnd");
  }
  if (isJobEnough(state, minimal, usage)) kinds.push(minimal);
  return kinds.length > 0 ? kinds : null;
}

function isJobEnough(state: EngineState, kind: JobKind, usage: number): boolean {
  const resets = JOB_RESETS[kind];
  const counters = state.norm.counters;
  for (let c = 0; c < counters.length; c++) {
    const usedAfter = resets.includes(counters[c].kind) ? 0 : state.used[c];
    if (usedAfter + usage > counters[c].limit + USAGE_EPSILON) return false;
  }
  return true;
}

/** Life a job would throw away: what is left on the counters it renews, if still usable. */
export function findWastedLife(state: EngineState, kind: JobKind, smallestUsageAhead: number): number {
  const resets = JOB_RESETS[kind];
  let least = Infinity;
  const counters = state.norm.counters;
  for (let c = 0; c < counters.length; c++) {
    if (resets.includes(counters[c].kind)) least = Math.min(least, counters[c].limit - state.used[c]);
  }
  if (!Number.isFinite(least) || least + USAGE_EPSILON < smallestUsageAhead) return 0;
  return least;
}

export function applyJob(state: EngineState, kind: JobKind, endDay: number): void {
  const resets = JOB_RESETS[kind];
  state.norm.counters.forEach((c, i) => {
    if (resets.includes(c.kind)) state.used[i] = 0;
  });
  state.busyUntil = Math.max(state.busyUntil, endDay);
}

/** Renews the engine for every pinned job finished before `day`. */
export function applyPinnedJobsBefore(state: EngineState, day: number): void {
  for (const slot of state.pinnedJobs) {
    if (!slot.applied && slot.endDay < day) {
      applyJob(state, slot.kind, slot.endDay);
      slot.applied = true;
    }
  }
}

export function isBlockedByPins(state: EngineState, startDay: number, endDay: number, entryId: string | null): boolean {
  for (const slot of state.pinnedJobs) {
    if (!slot.applied && slot.startDay <= endDay && slot.endDay >= startDay) return true;
  }
  for (const run of state.pinnedRuns) {
    if (run.entryId !== entryId && run.startDay <= endDay && run.endDay >= startDay) return true;
  }
  return false;
}
