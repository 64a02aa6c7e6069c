import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  computeCrankAngleForTravelDeg,
  computeExhaustDurationDeg,
  computeExhaustOpensDegAtdc,
  computeExhaustOpensFromTravelDeg,
  computeExhaustTravelMm,
  computePistonTravelMm,
  computePistonTravelOverTurnMm,
} from "../../../src/lib/domain/slider-crank";
import { inchesToMm } from "../../../src/lib/domain/units";
import { expectFieldError, expectPrinted } from "./expect-helpers";

// Any stroke, and a rod longer than half of it (real engines: rod/crank radius about 3–4.5).
const crank = fc
  .record({
    strokeMm: fc.double({ min: 10, max: 200, noNaN: true }),
    rodShare: fc.double({ min: 0.51, max: 5, noNaN: true }),
  })
  .map(({ strokeMm, rodShare }) => ({ strokeMm, rodMm: strokeMm * rodShare }));

describe("piston travel from TDC", () => {
  // Wikipedia, "Piston motion equations", Position: the article's example l = 6 in, r = 2 in
  // (stroke 4 in), printed to six decimals.
  const printed: Array<[number, number]> = [
    [30, 0.351869],
    [60, 1.255437],
    [90, 2.343146],
    [120, 3.255437],
    [180, 4],
  ];

  it("matches the published slider-crank values (inches)", () => {
    for (const [angle, travel] of printed) {
      expectPrinted(computePistonTravelMm(4, 6, angle), travel, 6);
    }
  });

  it("matches the same values worked in millimetres", () => {
    // Same source; the function is unit-agnostic, so 4 in / 6 in in mm gives 25.4 × the travel.
    for (const [angle, travel] of printed) {
      const mm = computePistonTravelMm(inchesToMm(4), inchesToMm(6), angle);
      expect(Math.abs(mm - inchesToMm(travel))).toBeLessThanOrEqual(25.4 * 0.5e-6);
    }
  });

  it("is exactly 0 at TDC and exactly the stroke at BDC (property)", () => {
    fc.assert(
      fc.property(crank, ({ strokeMm, rodMm }) => {
        expect(computePistonTravelMm(strokeMm, rodMm, 0)).toBe(0);
        expect(computePistonTravelMm(strokeMm, rodMm, 180)).toBe(strokeMm);
        expect(computePistonTravelOverTurnMm(strokeMm, rodMm, 360)).toBeLessThan(1e-12 * strokeMm);
      }),
    );
  });

  it("is symmetric about BDC: travel(360° − A) = travel(A) (property)", () => {
    fc.assert(
      fc.property(crank, fc.double({ min: 0, max: 360, noNaN: true }), ({ strokeMm, rodMm }, angle) => {
        const down = computePistonTravelOverTurnMm(strokeMm, rodMm, angle);
        const up = computePistonTravelOverTurnMm(strokeMm, rodMm, 360 - angle);
        expect(Math.abs(down - up)).toBeLessThanOrEqual(1e-9 * strokeMm);
      }),
    );
  });

  it("rises steadily from TDC to BDC and never leaves 0…stroke (property)", () => {
    fc.assert(
      fc.property(
        crank,
        fc.double({ min: 0, max: 180, noNaN: true }),
        fc.double({ min: 0, max: 180, noNaN: true }),
        ({ strokeMm, rodMm }, a, b) => {
          const [lo, hi] = a <= b ? [a, b] : [b, a];
          const sLo = computePistonTravelMm(strokeMm, rodMm, lo);
          const sHi = computePistonTravelMm(strokeMm, rodMm, hi);
          expect(sLo).toBeLessThanOrEqual(sHi + 1e-12 * strokeMm);
          expect(sLo).toBeGreaterThanOrEqual(0);
          expect(sHi).toBeLessThanOrEqual(strokeMm);
        },
      ),
    );
  });

  it("is past half stroke at 90° because of the rod's angularity", () => {
    // Wikipedia, "Piston motion equations": s(90°) = 2.343146 in > r = 2 in for l = 6 in
    expect(computePistonTravelMm(4, 6, 90)).toBeGreaterThan(2);
  });
});

describe("crank angle from travel", () => {
  it("inverts the travel (property)", () => {
    fc.assert(
      fc.property(crank, fc.double({ min: 0.5, max: 179.5, noNaN: true }), ({ strokeMm, rodMm }, angle) => {
        const travel = computePistonTravelMm(strokeMm, rodMm, angle);
        expect(Math.abs(computeCrankAngleForTravelDeg(strokeMm, rodMm, travel) - angle)).toBeLessThan(1e-6);
      }),
    );
  });

  it("gives 0° and 180° at the ends of the stroke", () => {
    expect(computeCrankAngleForTravelDeg(73.8, 130, 0)).toBe(0);
    expect(computeCrankAngleForTravelDeg(73.8, 130, 73.8)).toBeCloseTo(180, 9);
  });

  it("reproduces the published example backwards", () => {
    // Wikipedia, "Piston motion equations": s(60°) = 1.255437 in at l = 6 in, r = 2 in
    expect(computeCrankAngleForTravelDeg(4, 6, 1.255437)).toBeCloseTo(60, 4);
  });
});

describe("exhaust timing", () => {
  it("converts duration to opening angle and back", () => {
    // Opening symmetrical about BDC: A = 180° − D/2 (REFERENCES.md, two-stroke trapped compression)
    expect(computeExhaustOpensDegAtdc(196)).toBe(82);
    expect(computeExhaustDurationDeg(82)).toBe(196);
    expect(computeExhaustOpensDegAtdc(360)).toBe(0);
    expect(computeExhaustOpensDegAtdc(0)).toBe(180);
  });

  it("places the port edge by its opening angle and recovers the angle from the edge", () => {
    // DEMO.md engine A-1 (72 × 73.8 mm, rod 130 mm, exhaust opens 82° ATDC): worked-through check
    const travel = computeExhaustTravelMm(73.8, 130, 82);
    expect(travel).toBeGreaterThan(73.8 / 2);
    expect(computeExhaustOpensFromTravelDeg(73.8, 130, travel)).toBeCloseTo(82, 9);
  });
});

describe("invalid input", () => {
  it("names the field", () => {
    expectFieldError(() => computePistonTravelMm(0, 130, 30), "strokeMm");
    expectFieldError(() => computePistonTravelMm(-70, 130, 30), "strokeMm");
    expectFieldError(() => computePistonTravelMm(Number.NaN, 130, 30), "strokeMm");
    expectFieldError(() => computePistonTravelMm(70, 35, 30), "rodMm"); // rod = stroke/2 is too short
    expectFieldError(() => computePistonTravelMm(70, 20, 30), "rodMm");
    expectFieldError(() => computePistonTravelMm(70, 130, -1), "crankAngleDeg");
    expectFieldError(() => computePistonTravelMm(70, 130, 181), "crankAngleDeg");
    expectFieldError(() => computePistonTravelMm(70, 130, Number.NaN), "crankAngleDeg");
    expectFieldError(() => computePistonTravelOverTurnMm(70, 130, 361), "crankAngleDeg");
    expectFieldError(() => computeExhaustOpensDegAtdc(400), "exhaustDurationDeg");
    expectFieldError(() => computeExhaustDurationDeg(190), "exhaustOpensDegAtdc");
    expectFieldError(() => computeExhaustTravelMm(70, 130, 200), "exhaustOpensDegAtdc");
    expectFieldError(() => computeExhaustOpensFromTravelDeg(70, 130, 71), "exhaustTravelMm");
    expectFieldError(() => computeCrankAngleForTravelDeg(70, 130, -0.1), "travelMm");
  });
});
