import { findLifeLeft, USAGE_EPSILON, type EngineState } from "./engine-state";

// Picks engines that already have the life an entry needs, without a job. Engines are split
// into tiers (spare before one another chassis still needs, altitude-safe before not), and
// within a tier sorted by life left, so "least life that still covers" (or "freshest", for an
// important event) is a binary search plus a skip over engines already taken.

interface Tier {
  engines: EngineState[];
  life: Float64Array;
  nextFree: Int32Array;
  prevFree: Int32Array;
}

function findNext(tier: Tier, i: number): number {
  let root = i;
  while (root < tier.engines.length && tier.nextFree[root] !== root) root = tier.nextFree[root];
  let walk = i;
  while (walk < tier.engines.length && tier.nextFree[walk] !== walk) {
    const step = tier.nextFree[walk];
    tier.nextFree[walk] = root;
    walk = step;
  }
  return root;
}

function findPrev(tier: Tier, i: number): number {
  let root = i;
  while (root >= 0 && tier.prevFree[root] !== root) root = tier.prevFree[root];
  let walk = i;
  while (walk >= 0 && tier.prevFree[walk] !== walk) {
    const step = tier.prevFree[walk];
    tier.prevFree[walk] = root;
    walk = step;
  }
  return root;
}

export class CoveringPool {
  private readonly tiers: Tier[];

  constructor(candidates: EngineState[], tierCount: number, tierOf: (e: EngineState) => number) {
    const grouped: EngineState[][] = Array.from({ length: tierCount }, () => []);
    for (const e of candidates) grouped[tierOf(e)].push(e);
    this.tiers = grouped.map((engines) => {
      const withLife = engines.map((e) => ({ e, life: findLifeLeft(e) }));
      withLife.sort((a, b) => a.life - b.life || (a.e.norm.id < b.e.norm.id ? -1 : 1));
      const n = withLife.length;
      return {
        engines: withLife.map((x) => x.e),
        life: Float64Array.from(withLife.map((x) => x.life)),
        nextFree: Int32Array.from({ length: n }, (_, i) => i),
        prevFree: Int32Array.from({ length: n }, (_, i) => i),
      };
    });
  }

  /**
   * Takes the best engine for `usage` from the first tier that has one, or returns null.
   * Engines taken through another pool in the same event are skipped (and dropped here too).
   */
  take(usage: number, freshest: boolean, eventIndex: number): EngineState | null {
    for (const tier of this.tiers) {
      const n = tier.engines.length;
      if (n === 0) continue;
      let pick = -1;
      if (freshest) {
        let last = findPrev(tier, n - 1);
        while (last >= 0 && tier.engines[last].takenAtEvent === eventIndex) {
          removeAt(tier, last);
          last = findPrev(tier, last - 1);
        }
        if (last >= 0 && tier.life[last] + USAGE_EPSILON >= usage) pick = last;
      } else {
        let lo = 0;
        let hi = n;
        while (lo < hi) {
          const mid = (lo + hi) >> 1;
          if (tier.life[mid] + USAGE_EPSILON >= usage) hi = mid;
          else lo = mid + 1;
        }
        let next = findNext(tier, lo);
        while (next < n && tier.engines[next].takenAtEvent === eventIndex) {
          removeAt(tier, next);
          next = findNext(tier, next + 1);
        }
        if (next < n) pick = next;
      }
      if (pick >= 0) {
        removeAt(tier, pick);
        return tier.engines[pick];
      }
    }
    return null;
  }
}

function removeAt(tier: Tier, i: number): void {
  tier.nextFree[i] = i + 1;
  tier.prevFree[i] = i - 1;
}
