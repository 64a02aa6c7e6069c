import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { checkPlan } from "../../../src/lib/domain/planner/check-plan";
import { generateFleet } from "../../../src/lib/domain/planner/generate-fleet";
import { computeRebuildLowerBound } from "../../../src/lib/domain/planner/lower-bound";
import { planRebuilds } from "../../../src/lib/domain/planner/plan-rebuilds";
import type { PlannerEngine, PlannerEvent, PlannerInput, RebuildPlan } from "../../../src/lib/domain/planner/types";
import { seasonArb } from "./arbitrary-season";

// Properties over generated seasons: the independent checker finds nothing wrong with any plan,
// every entry gets an engine or a listed conflict (and never both), the same season always
// gives the same plan, and the lower bound never exceeds the true minimum.

function expectSoundPlan(input: PlannerInput, plan: RebuildPlan): void {
  expect(checkPlan(input, plan)).toEqual([]);
  const conflicted = plan.conflicts.flatMap((c) => (c.entryId ? [c.entryId] : []));
  expect(new Set(conflicted).size).toBe(conflicted.length);
  for (const entryId of conflicted) expect(plan.assignments[entryId]).toBeUndefined();
  const inScope = input.events.filter((e) => e.startDate >= input.today).flatMap((e) => e.entries.map((x) => x.entryId));
  expect(Object.keys(plan.assignments).length + conflicted.length).toBe(inScope.length);
  expect(plan.stats.assignedCount).toBe(Object.keys(plan.assignments).length);
}

function shuffleSeason(input: PlannerInput, order: number[]): PlannerInput {
  const permute = <T,>(items: T[]): T[] => items.map((_, i) => ({ v: items[i], k: order[i % order.length] * 31 + i })).sort((a, b) => a.k - b.k).map((x) => x.v);
  return {
    ...input,
    engines: permute(input.engines),
    events: permute(input.events).map((e) => ({ ...e, entries: permute(e.entries) })),
    parts: permute(input.parts ?? []),
    jobPins: permute(input.jobPins ?? []),
    entryPins: permute(input.entryPins ?? []),
  };
}

describe("planner properties", () => {
  it("plans generated fleets without a single violation, starved shops included", () => {
    fc.assert(
      fc.property(
        fc.record({
          engines: fc.integer({ min: 1, max: 14 }),
          events: fc.integer({ min: 1, max: 10 }),
          seed: fc.integer(),
          shopScale: fc.constantFrom(0.02, 0.2, 1, 2),
          overlapShare: fc.constantFrom(0, 0.3, 0.7),
          entryPins: fc.integer({ min: 0, max: 3 }),
          jobPins: fc.integer({ min: 0, max: 3 }),
          withParts: fc.boolean(),
        }),
        (options) => {
          const input = generateFleet(options);
          expectSoundPlan(input, planRebuilds(input));
        },
      ),
      { numRuns: 120 },
    );
  });

  it("plans awkward hand-rolled seasons without a single violation", () => {
    fc.assert(
      fc.property(seasonArb, (input) => {
        expectSoundPlan(input, planRebuilds(input));
      }),
      { numRuns: 400 },
    );
  });

  it("gives the same plan whatever the order of engines, events, entries and pins", () => {
    fc.assert(
      fc.property(seasonArb, fc.array(fc.nat({ max: 50 }), { minLength: 1, maxLength: 8 }), (input, order) => {
        const a = planRebuilds(input);
        const b = planRebuilds(shuffleSeason(input, order));
        expect(b).toEqual(a);
      }),
      { numRuns: 200 },
    );
  });

  it("never spends fewer rebuilds than the lower bound when every entry runs", () => {
    fc.assert(
      fc.property(seasonArb, (input) => {
        const plan = planRebuilds(input);
        // A conflict drops demand: only plans that run every entry must respect the bound.
        const comparable = plan.stats.conflictCount === 0;
        expect(!comparable || plan.stats.rebuildCount >= plan.stats.lowerBound).toBe(true);
        expect(plan.stats.lowerBound).toBe(computeRebuildLowerBound(input).rebuilds);
      }),
      { numRuns: 300 },
    );
  });
});

// Exhaustive search over tiny seasons (top-end limits only, one-day Saturday events, a shop
// with hours to spare): the fewest rebuilds any plan can manage.
function findFewestRebuilds(engines: PlannerEngine[], events: PlannerEvent[]): number {
  const limits = engines.map((e) => e.policy.topEndLimit);
  const memo = new Map<string, number>();
  const search = (k: number, used: number[]): number => {
    if (k === events.length) return 0;
    const key = `${k}|${used.join(",")}`;
    const known = memo.get(key);
    if (known !== undefined) return known;
    let best = Infinity;
    const entries = events[k].entries;
    const place = (j: number, state: number[], taken: Set<number>, cost: number): void => {
      if (j === entries.length) {
        best = Math.min(best, cost + search(k + 1, state));
        return;
      }
      const u = entries[j].expectedUsage;
      for (let e = 0; e < engines.length; e++) {
        if (taken.has(e) || u > limits[e] + 1e-9) continue;
        const rebuild = state[e] + u > limits[e] + 1e-9;
        const next = [...state];
        next[e] = (rebuild ? 0 : state[e]) + u;
        place(j + 1, next, new Set([...taken, e]), cost + (rebuild ? 1 : 0));
      }
    };
    place(0, used, new Set(), 0);
    memo.set(key, best);
    return best;
  };
  return search(0, engines.map((e) => e.counters.sinceTopEnd));
}

const tinySeasonArb = fc
  .record({
    engines: fc.array(fc.record({ limit: fc.integer({ min: 2, max: 6 }), usedHalves: fc.nat({ max: 12 }) }), { minLength: 1, maxLength: 3 }),
    events: fc.array(fc.array(fc.constantFrom(0.5, 1, 1.5, 2), { minLength: 1, maxLength: 2 }), { minLength: 1, maxLength: 5 }),
  })
  .map(({ engines, events }): PlannerInput => ({
    today: "2026-02-02",
    engines: engines.map((e, i) => ({
      id: `E${i}`,
      name: `E${i}`,
      counters: { sinceTopEnd: Math.min(e.limit, e.usedHalves / 2), sinceBottomEnd: 0, sinceInspection: 0 },
      policy: { topEndLimit: e.limit, planFraction: 0.8 },
      chassisId: `c${i}`,
      status: "running",
    })),
    events: events.map((usages, k) => {
      const day = new Date(Date.UTC(2026, 1, 7 + 7 * k)).toISOString().slice(0, 10);
      return {
        id: `V${k}`,
        name: `V${k}`,
        startDate: day,
        endDate: day,
        elevationM: 500,
        important: false,
        entries: usages.map((u, j) => ({ entryId: `V${k}/c${j}`, chassisId: `c${j}`, expectedUsage: u })),
      };
    }),
    shop: {
      hoursPerWeekday: [24, 24, 24, 24, 24, 0, 0],
      closedDates: [],
      labourHours: { topEnd: 1, bottomEnd: 2, inspection: 1 },
      partsLeadDays: 0,
    },
  }));

describe("lower bound against the true minimum", () => {
  it("never exceeds the fewest rebuilds an exhaustive search finds", () => {
    fc.assert(
      fc.property(tinySeasonArb, (input) => {
        const fewest = findFewestRebuilds(input.engines, input.events);
        fc.pre(Number.isFinite(fewest));
        expect(computeRebuildLowerBound(input).rebuilds).toBeLessThanOrEqual(fewest);
        const plan = planRebuilds(input);
        expect(checkPlan(input, plan)).toEqual([]);
        if (plan.stats.conflictCount === 0) expect(plan.stats.rebuildCount).toBeGreaterThanOrEqual(fewest);
      }),
      { numRuns: 300 },
    );
  });
});
