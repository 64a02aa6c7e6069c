import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  computeBowlDiameterForSquishAreaMm,
  computeSquishAreaRatio,
  computeSquishMeanMm,
  computeSquishSideDifferenceMm,
  summarizeSquish,
} from "../../../src/lib/domain/squish";
import { expectFieldError, expectRelative } from "./expect-helpers";

describe("squish from two sides", () => {
  it("averages the sides and reports their difference", () => {
    // DEMO.md A-1: 1.20 / 1.21 mm (consistency check; the class rule averages both sides, TRADE.md)
    expect(computeSquishMeanMm(1.2, 1.21)).toBeCloseTo(1.205, 12);
    expect(computeSquishSideDifferenceMm(1.2, 1.21)).toBeCloseTo(0.01, 12);
    expect(computeSquishSideDifferenceMm(1.21, 1.2)).toBeCloseTo(0.01, 12);
    expect(summarizeSquish(1.45, 1.53)).toEqual({ meanMm: 1.49, sideDifferenceMm: expect.closeTo(0.08, 12) });
  });

  it("refuses zero, negative and NaN sides", () => {
    expectFieldError(() => computeSquishMeanMm(0, 1.2), "squishSideAMm");
    expectFieldError(() => computeSquishMeanMm(1.2, -1), "squishSideBMm");
    expectFieldError(() => computeSquishSideDifferenceMm(Number.NaN, 1.2), "squishSideAMm");
  });
});

describe("squish area ratio", () => {
  it("follows 1 − (d/B)²", () => {
    // REFERENCES.md formula; Blair (from memory): typically about 0.45–0.55 for two-strokes
    expect(computeSquishAreaRatio(70, 100)).toBeCloseTo(0.51, 12);
    expectRelative(computeSquishAreaRatio(50, 72), 1 - (50 / 72) ** 2, 1e-12);
    expect(computeSquishAreaRatio(72, 72)).toBe(0);
  });

  it("inverts to the bowl diameter (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: 30, max: 120, noNaN: true }), fc.double({ min: 0, max: 0.99, noNaN: true }), (boreMm, ratio) => {
        const bowl = computeBowlDiameterForSquishAreaMm(ratio, boreMm);
        expect(computeSquishAreaRatio(bowl, boreMm)).toBeCloseTo(ratio, 9);
      }),
    );
  });

  it("shrinks as the bowl widens and stays within 0…1 (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.05, max: 0.95, noNaN: true }), fc.double({ min: 0.001, max: 0.05, noNaN: true }), (share, wider) => {
        const a = computeSquishAreaRatio(72 * share, 72);
        const b = computeSquishAreaRatio(72 * (share + wider), 72);
        expect(b).toBeLessThan(a);
        expect(a).toBeGreaterThan(0);
        expect(a).toBeLessThan(1);
      }),
    );
  });

  it("refuses a bowl wider than the bore", () => {
    expectFieldError(() => computeSquishAreaRatio(80, 72), "bowlDiameterMm");
    expectFieldError(() => computeSquishAreaRatio(0, 72), "bowlDiameterMm");
    expectFieldError(() => computeSquishAreaRatio(50, 0), "boreMm");
    expectFieldError(() => computeBowlDiameterForSquishAreaMm(1, 72), "squishAreaRatio");
  });
});
