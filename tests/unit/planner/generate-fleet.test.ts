import { describe, expect, it } from "vitest";
import { DomainInputError } from "../../../src/lib/domain/errors";
import { createSeededRandom, generateFleet } from "../../../src/lib/domain/planner/generate-fleet";

describe("createSeededRandom", () => {
  it("repeats itself for a seed and stays in [0, 1)", () => {
    const a = createSeededRandom(42);
    const b = createSeededRandom(42);
    const c = createSeededRandom(43);
    const xs = Array.from({ length: 1000 }, () => a());
    expect(Array.from({ length: 1000 }, () => b())).toEqual(xs);
    expect(Array.from({ length: 1000 }, () => c())).not.toEqual(xs);
    expect(xs.every((x) => x >= 0 && x < 1)).toBe(true);
    // A uniform draw averages 0.5; 1000 draws sit within ±0.05 of it (σ ≈ 0.009).
    expect(Math.abs(xs.reduce((s, x) => s + x, 0) / xs.length - 0.5)).toBeLessThan(0.05);
  });
});

describe("generateFleet", () => {
  it("builds the same fleet from the same seed and another from another seed", () => {
    expect(generateFleet({ engines: 50, events: 20, seed: 7 })).toEqual(generateFleet({ engines: 50, events: 20, seed: 7 }));
    expect(generateFleet({ engines: 50, events: 20, seed: 8 })).not.toEqual(generateFleet({ engines: 50, events: 20, seed: 7 }));
  });

  it("has the asked sizes, seats about 80 % of the engines and enters 50–100 % of a pool", () => {
    const fleet = generateFleet({ engines: 500, events: 60, seed: 1 });
    expect(fleet.engines).toHaveLength(500);
    expect(fleet.events).toHaveLength(60);
    const seated = fleet.engines.filter((e) => e.chassisId !== null).length;
    expect(seated).toBeGreaterThan(380);
    expect(seated).toBeLessThan(420);
    const entries = fleet.events.map((e) => e.entries.length);
    expect(Math.max(...entries)).toBeLessThanOrEqual(seated);
    expect(entries.filter((n) => n >= 200).length).toBeGreaterThan(40);
  });

  it("enters each chassis with the family of the engines that sit in such chassis", () => {
    const fleet = generateFleet({ engines: 60, events: 10, seed: 3 });
    const familyOfChassis = new Map(fleet.engines.filter((e) => e.chassisId).map((e) => [e.chassisId, e.family]));
    for (const event of fleet.events) {
      for (const entry of event.entries) {
        if (familyOfChassis.has(entry.chassisId)) expect(entry.engineFamily).toBe(familyOfChassis.get(entry.chassisId));
      }
    }
  });

  it("never enters one chassis in two events that overlap", () => {
    const fleet = generateFleet({ engines: 40, events: 30, seed: 5, overlapShare: 0.8 });
    for (const a of fleet.events) {
      for (const b of fleet.events) {
        if (a.id >= b.id || a.endDate < b.startDate || b.endDate < a.startDate) continue;
        const shared = a.entries.filter((x) => b.entries.some((y) => y.chassisId === x.chassisId));
        expect(shared).toEqual([]);
      }
    }
  });

  it("rejects sizes that are not whole numbers", () => {
    expect(() => generateFleet({ engines: 0, events: 3, seed: 1 })).toThrow(DomainInputError);
    expect(() => generateFleet({ engines: 3, events: 2.5, seed: 1 })).toThrow(DomainInputError);
  });
});
