import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { confirmChamberReadings, confirmReadings, DEFAULT_CHAMBER_TOLERANCE_CC } from "../../../src/lib/domain/readings";
import { expectFieldError } from "./expect-helpers";

// The rule is PRODUCT.md's (readings repeated until two agree within the team's tolerance);
// the 0.2 cc default is common practice for a burette graduated in tenths (TRADE.md, from memory).

describe("confirmReadings", () => {
  it("has a 0.2 cc default for chamber volume", () => {
    expect(DEFAULT_CHAMBER_TOLERANCE_CC).toBe(0.2);
    expect(confirmChamberReadings([23.4, 23.7]).status).toBe("unconfirmed");
    expect(confirmChamberReadings([23.4, 23.7], 0.3).status).toBe("confirmed");
  });

  it("reports an empty set as empty", () => {
    expect(confirmReadings([], 0.2)).toEqual({ status: "empty", disagreeing: [], disagreeingIndexes: [] });
  });

  it("leaves a single reading unconfirmed", () => {
    const result = confirmReadings([23.6], 0.2);
    expect(result.status).toBe("unconfirmed");
    expect(result.value).toBeUndefined();
    expect(result.disagreeing).toEqual([23.6]);
  });

  it("accepts a pair exactly at the tolerance despite decimal round-off", () => {
    // 23.6 − 23.4 is 0.20000000000000284 in binary: still a 0.2 cc gap on the burette
    const result = confirmReadings([23.4, 23.6], 0.2);
    expect(result.status).toBe("confirmed");
    expect(result.value).toBeCloseTo(23.5, 12);
    expect(result.agreeingPair).toEqual([23.4, 23.6]);
    expect(confirmReadings([23.4, 23.61], 0.2).status).toBe("unconfirmed");
  });

  it("takes the closest pair and names the reading that stands apart", () => {
    const result = confirmReadings([23.2, 23.6, 23.5], 0.2);
    expect(result.status).toBe("confirmed");
    expect(result.agreeingPair).toEqual([23.6, 23.5]);
    expect(result.agreeingIndexes).toEqual([1, 2]);
    expect(result.value).toBeCloseTo(23.55, 12);
    expect(result.disagreeing).toEqual([23.2]);
    expect(result.disagreeingIndexes).toEqual([0]);
  });

  it("prefers the most recent pair on a tie", () => {
    const result = confirmReadings([23.4, 23.5, 23.6], 0.2);
    expect(result.agreeingIndexes).toEqual([1, 2]);
    expect(result.value).toBeCloseTo(23.55, 12);
    expect(result.disagreeing).toEqual([]); // 23.4 is within 0.2 of 23.55
    // a closer pair beats a more recent one
    expect(confirmReadings([23.5, 23.6, 23.5], 0.2).agreeingIndexes).toEqual([0, 2]);
  });

  it("lists every reading when none agree", () => {
    const result = confirmReadings([23.0, 23.5, 24.0], 0.2);
    expect(result.status).toBe("unconfirmed");
    expect(result.disagreeing).toEqual([23.0, 23.5, 24.0]);
    expect(result.disagreeingIndexes).toEqual([0, 1, 2]);
  });

  it("confirms any set holding a repeated reading, at its closest pair (property)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 10, max: 40, noNaN: true }), { minLength: 1, maxLength: 8 }),
        fc.nat(),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (values, pick, tolerance) => {
          const repeated = [...values, values[pick % values.length]];
          const result = confirmReadings(repeated, tolerance);
          expect(result.status).toBe("confirmed");
          const [a, b] = result.agreeingPair ?? [Number.NaN, Number.NaN];
          expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-9 * 40);
          expect(result.value).toBeGreaterThanOrEqual(Math.min(a, b));
          expect(result.value).toBeLessThanOrEqual(Math.max(a, b));
        },
      ),
    );
  });

  it("refuses a negative tolerance and non-finite readings", () => {
    expectFieldError(() => confirmReadings([23.6], -0.1), "tolerance");
    expectFieldError(() => confirmReadings([23.6, Number.NaN], 0.2), "values");
    expectFieldError(() => confirmChamberReadings([23.6], -1), "tolerance");
  });
});
