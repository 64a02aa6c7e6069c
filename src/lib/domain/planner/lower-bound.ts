import { normalizePlannerInput, type NormEngine, type NormInput } from "./normalize-input";
import type { JobKind, PlannerInput } from "./types";

// A proven minimum number of rebuilds (top-end plus bottom-end jobs) for a plan that serves
// every entry, used to judge the planner.
//
// Take the top end. Between two jobs that renew it (a top end or a bottom end) an engine runs
// a "life": the usages of the entries it runs then add up to at most its top-end limit (and at
// most each top-end part's limit); before its first such job, at most what is left today on
// its top-end and bottom-end counters (nothing else can renew either of them).
// The total demand D must fit into those lives, so with R renewing jobs
//     D ≤ Σ_e usable(left_e) + R · max_e usable(limit_e)
//     R ≥ ceil((D − Σ_e usable(left_e)) / max_e usable(limit_e)).
// usable(x) is the largest sum of entry usages (any number of each usage value that occurs)
// not above x: an engine with 8 h of life and 1.5 h entries can only ever run 7.5 h of them,
// so the bound counts 7.5 h, not 8. The same argument gives a bound on bottom-end jobs alone.
// Both count jobs inside the rebuild total, so the larger of the two is a lower bound for it.
// Every retired engine is left out (it runs nothing); every other engine is counted even if it
// is unavailable, which can only lower the bound, never make it wrong. When entries name an
// engine family, each family is a separate pool and the pools' bounds are summed.

export interface RebuildLowerBound {
  /** max(topEnd, bottomEnd): no plan serving every entry spends fewer rebuilds. */
  rebuilds: number;
  /** Minimum number of jobs renewing the top end (top ends plus bottom ends). */
  topEnd: number;
  /** Minimum number of bottom-end jobs. */
  bottomEnd: number;
  /** Total expected usage of the entries planned (events from today on). */
  demand: number;
}

/** DP size cap: beyond this the bound falls back to usable(x) = x, still valid, a bit looser. */
const MAX_DP_WORK = 20_000_000;

type UsableFn = (life: number) => number;

function buildUsableFn(usages: number[], largestLife: number): UsableFn {
  const distinct = [...new Set(usages.filter((u) => u > 0))].sort((a, b) => a - b);
  const identity: UsableFn = (life) => Math.max(0, life);
  if (distinct.length === 0) return () => 0;
  const scale = [100, 1000].find((s) => distinct.every((u) => Math.abs(u * s - Math.round(u * s)) < 1e-6));
  if (scale === undefined) return identity;
  const units = Math.floor(largestLife * scale + 1e-6);
  if (units * distinct.length > MAX_DP_WORK) return identity;
  const steps = distinct.map((u) => Math.round(u * scale));
  const reachable = new Uint8Array(units + 1);
  reachable[0] = 1;
  for (let x = 1; x <= units; x++) {
    for (const s of steps) {
      if (s <= x && reachable[x - s] === 1) {
        reachable[x] = 1;
        break;
      }
    }
  }
  const bestAtOrBelow = new Int32Array(units + 1);
  for (let x = 1; x <= units; x++) bestAtOrBelow[x] = reachable[x] === 1 ? x : bestAtOrBelow[x - 1];
  return (life) => {
    if (life <= 0) return 0;
    const x = Math.min(units, Math.floor(life * scale + 1e-6));
    return bestAtOrBelow[x] / scale;
  };
}

/**
 * Life before the first job of `kind` and after each one. Before the first job that renews the
 * top end, nothing renews the bottom end either, so the first life is also capped by what is
 * left of every counter that only such jobs renew.
 */
function findKindLife(engine: NormEngine, kind: JobKind): { left: number; fresh: number } | null {
  const renewed = engine.counters.filter((c) => c.kind === kind);
  if (renewed.length === 0) return null;
  const untilFirstJob = engine.counters.filter((c) => RENEWED_ONLY_BY[kind].includes(c.kind));
  return {
    left: Math.max(0, Math.min(...untilFirstJob.map((c) => c.limit - c.used))),
    fresh: Math.min(...renewed.map((c) => c.limit)),
  };
}

/**
 * Counter kinds that no job other than one renewing `kind` can renew: before the first top-end
 * or bottom-end job, top-end and bottom-end counters both stand; before the first bottom end,
 * the bottom-end counters do.
 */
const RENEWED_ONLY_BY: Record<JobKind, JobKind[]> = {
  topEnd: ["topEnd", "bottomEnd"],
  bottomEnd: ["bottomEnd"],
  inspection: ["inspection"],
};

function boundJobsRenewing(engines: NormEngine[], kind: JobKind, demand: number, usable: UsableFn): number {
  let leftTotal = 0;
  let bestLife = 0;
  for (const engine of engines) {
    const life = findKindLife(engine, kind);
    // An engine without this limit can run without end: nothing forces such a job.
    if (life === null) return 0;
    leftTotal += usable(life.left);
    bestLife = Math.max(bestLife, usable(life.fresh));
  }
  if (bestLife <= 0) return 0;
  const shortfall = demand - leftTotal;
  return shortfall <= 1e-9 ? 0 : Math.ceil(shortfall / bestLife - 1e-9);
}

function boundPool(engines: NormEngine[], demand: number, usable: UsableFn): { topEnd: number; bottomEnd: number } {
  if (engines.length === 0) return { topEnd: 0, bottomEnd: 0 };
  return {
    topEnd: boundJobsRenewing(engines, "topEnd", demand, usable),
    bottomEnd: boundJobsRenewing(engines, "bottomEnd", demand, usable),
  };
}

export function computeLowerBoundFromNorm(norm: NormInput): RebuildLowerBound {
  const distinctUsages = new Set<number>();
  const demandByFamily = new Map<string, number>();
  let demand = 0;
  for (const event of norm.events) {
    if (!event.inScope) continue;
    for (const entry of event.entries) {
      demand += entry.usage;
      distinctUsages.add(entry.usage);
      if (entry.family !== null) demandByFamily.set(entry.family, (demandByFamily.get(entry.family) ?? 0) + entry.usage);
    }
  }
  const engines = norm.engines.filter((e) => !e.retired);
  if (engines.length === 0) return { rebuilds: 0, topEnd: 0, bottomEnd: 0, demand };
  let largestLife = 0;
  for (const e of engines) for (const c of e.counters) largestLife = Math.max(largestLife, c.limit);
  const usable = buildUsableFn([...distinctUsages], largestLife);
  const whole = boundPool(engines, demand, usable);
  // Entries tied to an engine family can only be run by that family's engines: those pools are
  // disjoint, so their bounds add up (entries open to any engine are simply left out).
  const pooled = { topEnd: 0, bottomEnd: 0 };
  for (const family of [...demandByFamily.keys()].sort()) {
    const b = boundPool(engines.filter((e) => e.family === family), demandByFamily.get(family) ?? 0, usable);
    pooled.topEnd += b.topEnd;
    pooled.bottomEnd += b.bottomEnd;
  }
  const topEnd = Math.max(whole.topEnd, pooled.topEnd);
  const bottomEnd = Math.max(whole.bottomEnd, pooled.bottomEnd);
  return { rebuilds: Math.max(topEnd, bottomEnd), topEnd, bottomEnd, demand };
}

/** The rebuild lower bound for a season (see the argument at the top of this file). */
export function computeRebuildLowerBound(input: PlannerInput): RebuildLowerBound {
  return computeLowerBoundFromNorm(normalizePlannerInput(input));
}
