import { chooseJobKinds, findLifeLeft, USAGE_EPSILON, type EngineState } from "./engine-state";
import { describeEventRef, formatAmount, nameJobKind } from "./explain";
import type { NormEntry, NormInput } from "./normalize-input";
import type { PlanContext } from "./plan-context";
import { tryBookJob } from "./plan-jobs";

// The end of the season. A rebuild is only worth its price if the new life gets used, and an
// engine runs at most one entry per event, so near the end a rebuild can no longer be used in
// full. Rebuilding whenever an engine runs out then leaves many engines with most of a life
// unused on the last day. Instead, once the events left could barely use a whole life (the
// "closing stretch" of an engine pool), the planner:
//   1. counts the life the pool can still use against the demand left (each engine: the most it
//      could run from its life with at most one entry per event left: 1 h of life is worth
//      nothing when only 1.5 h entries remain), and if it falls short renews the engines with
//      the least usable life right away, while their new life can still be used;
//   2. runs the engines with the most life first, so that no engine ends the season holding life
//      the others needed (the classic rule for spreading runs over parallel slots).
// Both only change which engines are used when; every hard rule is still checked by the loop.

/** The entries an engine pool serves: one engine family, or "" for entries open to any engine. */
export type PoolKey = string;

export interface PoolOutlook {
  /** Demand of the pool's entries from each event (sorted index) to the end. */
  demandFrom: Float64Array;
  /** Most one engine could run from each event on: the largest usage of each event, summed. */
  perEngineFrom: Float64Array;
  /** The longest fresh life of any engine in the pool. */
  freshLife: number;
  /** Distinct usages of the pool's entries, per event. */
  usagesByEvent: number[][];
  /** usable(life) from each event on, built when first asked for. */
  usableFrom: Map<number, (life: number) => number>;
}

export function findPoolKey(family: string | null): PoolKey {
  return family ?? "";
}

export function isInPool(state: EngineState, key: PoolKey): boolean {
  return !state.norm.retired && (key === "" || state.norm.family === key);
}

/** Life after a full rebuild: a bottom end renews every counter (see JOB_RESETS). */
function findFreshLife(state: EngineState): number {
  return Math.min(...state.norm.counters.map((c) => c.limit));
}

export function buildPoolOutlooks(norm: NormInput, engines: EngineState[]): Map<PoolKey, PoolOutlook> {
  const n = norm.events.length;
  const outlooks = new Map<PoolKey, PoolOutlook>();
  const keys = new Set<PoolKey>();
  for (const event of norm.events) for (const entry of event.entries) keys.add(findPoolKey(entry.family));
  // Entries open to any engine share their engines with every family's entries: that pool has
  // no demand of its own to weigh, so it gets no outlook unless it is the only pool.
  if (keys.size > 1) keys.delete("");
  for (const key of [...keys].sort()) {
    const demandFrom = new Float64Array(n + 1);
    const perEngineFrom = new Float64Array(n + 1);
    const usagesByEvent: number[][] = Array.from({ length: n }, () => []);
    for (let k = n - 1; k >= 0; k--) {
      const event = norm.events[k];
      let demand = 0;
      let largest = 0;
      if (event.inScope) {
        for (const entry of event.entries) {
          if (findPoolKey(entry.family) !== key) continue;
          demand += entry.usage;
          largest = Math.max(largest, entry.usage);
          if (entry.usage > 0 && !usagesByEvent[k].includes(entry.usage)) usagesByEvent[k].push(entry.usage);
        }
      }
      demandFrom[k] = demandFrom[k + 1] + demand;
      perEngineFrom[k] = perEngineFrom[k + 1] + largest;
    }
    const members = engines.filter((s) => isInPool(s, key));
    const freshLife = members.length === 0 ? 0 : Math.max(...members.map(findFreshLife));
    outlooks.set(key, { demandFrom, perEngineFrom, freshLife, usagesByEvent, usableFrom: new Map() });
  }
  return outlooks;
}

/**
 * The closing stretch starts a little before the events left drop below one fresh life: a
 * life renewed then is still mostly used. Tuned on generated fleets (1.2 beat 1.0 and matched
 * 1.3 on seeds the tuning did not see).
 */
const CLOSING_LIFE_FACTOR = 1.2;

export function isClosingStretch(outlook: PoolOutlook | undefined, k: number): boolean {
  return outlook !== undefined && outlook.perEngineFrom[k] + USAGE_EPSILON < outlook.freshLife * CLOSING_LIFE_FACTOR;
}

/**
 * A pool counts as having life to spare when its usable life exceeds the demand left by this
 * factor: the usable-life figure is optimistic (it lets every engine run every event left), so
 * a pool that only just covers its demand still runs short. Tuned on generated fleets.
 */
const SPARE_LIFE_FACTOR = 1.25;

/** Centi-units: the usages of generated and real seasons (0.6 h, 1.5 h, 12.25 km) are exact. */
const USABLE_SCALE = 100;

/**
 * The most one engine with `life` could run from event `k` on, taking at most one entry per
 * event: the largest sum of one usage per event (or none) that fits. Falls back to the life
 * capped by the per-engine maximum when usages are finer than a hundredth.
 */
function findUsableFrom(outlook: PoolOutlook, k: number): (life: number) => number {
  const known = outlook.usableFrom.get(k);
  if (known) return known;
  const cap = outlook.perEngineFrom[k];
  const units = Math.ceil(Math.min(cap, outlook.freshLife) * USABLE_SCALE);
  const groups = outlook.usagesByEvent.slice(k).filter((g) => g.length > 0);
  const exact = groups.every((g) => g.every((u) => Math.abs(u * USABLE_SCALE - Math.round(u * USABLE_SCALE)) < 1e-6));
  let usable: (life: number) => number = (life) => Math.max(0, Math.min(life, cap));
  if (exact) {
    let reachable = new Uint8Array(units + 1);
    reachable[0] = 1;
    for (const group of groups) {
      const next = reachable.slice();
      for (const u of group) {
        const step = Math.round(u * USABLE_SCALE);
        for (let x = units; x >= step; x--) if (reachable[x - step] === 1) next[x] = 1;
      }
      reachable = next;
    }
    const best = new Int32Array(units + 1);
    for (let x = 1; x <= units; x++) best[x] = reachable[x] === 1 ? x : best[x - 1];
    usable = (life) => (life <= 0 ? 0 : best[Math.min(units, Math.floor(life * USABLE_SCALE + 1e-6))] / USABLE_SCALE);
  }
  outlook.usableFrom.set(k, usable);
  return usable;
}

/** Life the pool can still use from event `k` on. */
function sumUsableLife(ctx: PlanContext, key: PoolKey, usable: (life: number) => number): number {
  let supply = 0;
  for (const s of ctx.engines) if (isInPool(s, key)) supply += usable(findLifeLeft(s));
  return supply;
}

/** Per pool in its closing stretch: the engines that may stay in their chassis (null: all). */
export type ClosingRunners = Map<PoolKey, Set<number> | null>;

/**
 * The pools in their closing stretch at event `k`, each with the engines allowed to stay in
 * their chassis. While a pool has life to spare every engine may; once it is short, only the
 * engines with the most life, as many as the pool has open entries, may (step 2 above: the
 * chassis rule ranks below spending fewer rebuilds).
 */
export function findClosingRunners(ctx: PlanContext, k: number, open: NormEntry[], free: EngineState[]): ClosingRunners {
  const counts = new Map<PoolKey, number>();
  for (const entry of open) counts.set(findPoolKey(entry.family), (counts.get(findPoolKey(entry.family)) ?? 0) + 1);
  const runners = new Map<PoolKey, Set<number> | null>();
  for (const [key, count] of [...counts.entries()].sort()) {
    const outlook = ctx.outlooks.get(key);
    if (!outlook || !isClosingStretch(outlook, k)) continue;
    if (sumUsableLife(ctx, key, findUsableFrom(outlook, k)) >= outlook.demandFrom[k] * SPARE_LIFE_FACTOR - USAGE_EPSILON) {
      runners.set(key, null);
      continue;
    }
    // Between engines with equal life, the one already in an entered chassis runs: no move.
    const entered = new Set(open.filter((x) => findPoolKey(x.family) === key).map((x) => x.chassisId));
    const seatedRank = (s: EngineState): number => (s.chassisId !== null && entered.has(s.chassisId) ? 0 : 1);
    const ranked = free
      .filter((s) => isInPool(s, key) && s.takenAtEvent !== k)
      .map((s) => ({ s, life: findLifeLeft(s) }))
      .sort((a, b) => b.life - a.life || seatedRank(a.s) - seatedRank(b.s) || (a.s.norm.id < b.s.norm.id ? -1 : 1));
    runners.set(key, new Set(ranked.slice(0, count).map((x) => x.s.norm.index)));
  }
  return runners;
}

/**
 * Step 1 above for pool `key` at event `k`: renews engines now while the pool's usable life
 * falls short of the demand left. `free` are the engines free for event k.
 */
export function renewForClosingStretch(ctx: PlanContext, k: number, key: PoolKey, outlook: PoolOutlook, free: EngineState[]): void {
  const cap = outlook.perEngineFrom[k];
  const usable = findUsableFrom(outlook, k);
  let supply = sumUsableLife(ctx, key, usable);
  let deficit = outlook.demandFrom[k] - supply;
  if (deficit <= USAGE_EPSILON) return;
  const smallest = ctx.smallestUsageFrom[k];
  const candidates = free
    .filter((s) => isInPool(s, key) && s.takenAtEvent !== k)
    .map((s) => ({ s, usable: usable(findLifeLeft(s)) }))
    .sort((a, b) => a.usable - b.usable || (a.s.norm.id < b.s.norm.id ? -1 : 1));
  const event = ctx.norm.events[k];
  // Renewing an engine that can still use most of what it has buys little and throws life away.
  const worthwhile = 0.5 * Math.min(cap, outlook.freshLife);
  for (const { s, usable: before } of candidates) {
    if (deficit <= USAGE_EPSILON || before > cap - worthwhile) break;
    const kinds = chooseJobKinds(s, Math.max(0, findLifeLeft(s)) + smallest);
    if (kinds === null || kinds.length === 0) continue;
    const lifeBefore = findLifeLeft(s);
    const attempt = tryBookJob(ctx, s, kinds, event, (kind) =>
      `${nameJobKind(kind)} before ${describeEventRef(event)}: ${formatAmount(Math.max(0, lifeBefore))} ${ctx.norm.usageUnit} left, and the ${key === "" ? "" : `${key} `}engines can still use only ${formatAmount(supply)} ${ctx.norm.usageUnit} of the ${formatAmount(outlook.demandFrom[k])} ${ctx.norm.usageUnit} their entries need this season; renewed now, while its new life can still be used before the last event`,
    );
    if (!attempt.ok) continue;
    const gained = usable(findLifeLeft(s)) - before;
    deficit -= gained;
    supply += gained;
  }
}
