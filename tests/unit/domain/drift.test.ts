import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { mean, sampleVariance, sum } from "simple-statistics";
import {
  computeCusum,
  computeEwma,
  computeIndividualsChart,
  D2_MOVING_RANGE_OF_TWO,
  D4_MOVING_RANGE_OF_TWO,
} from "../../../src/lib/domain/drift";
import { DomainInputError } from "../../../src/lib/domain/errors";

// Printed tables are checked to half a unit of their last printed digit (REFERENCES.md).
function expectPrinted(actual: number, printed: number, decimals: number): void {
  expect(Math.abs(actual - printed)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-9);
}

function expectFieldError(fn: () => unknown, field: string): void {
  try {
    fn();
  } catch (err) {
    expect(err).toBeInstanceOf(DomainInputError);
    expect((err as DomainInputError).field).toBe(field);
    return;
  }
  throw new Error(`expected a DomainInputError naming ${field}`);
}

describe("computeIndividualsChart", () => {
  // NIST/SEMATECH e-Handbook 6.3.2.2, flow-rate example (values as quoted in REFERENCES.md):
  // mean 50.81, MR-bar 1.8778, UCL 55.8041, LCL 45.8159 with d2 = 1.128.
  const flowRate = [49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1];

  it("reproduces the handbook's flow-rate example", () => {
    const chart = computeIndividualsChart(flowRate);
    expectPrinted(chart.mean, 50.81, 2);
    expectPrinted(chart.averageMovingRange, 1.8778, 4);
    expectPrinted(chart.upper, 55.8041, 4);
    expectPrinted(chart.lower, 45.8159, 4);
    // The handbook finds the process in control: no reading outside the limits.
    expect(chart.signals).toEqual([]);
  });

  it("agrees with simple-statistics and an independent moving-range sum", () => {
    const chart = computeIndividualsChart(flowRate);
    expect(chart.mean).toBeCloseTo(mean(flowRate), 12);
    // Moving ranges by hand from the data: 2.0 2.3 1.4 3.5 3.4 1.4 0.2 1.2 1.5 (sum 16.9).
    [2.0, 2.3, 1.4, 3.5, 3.4, 1.4, 0.2, 1.2, 1.5].forEach((r, i) => expect(chart.movingRanges[i]).toBeCloseTo(r, 10));
    expect(chart.averageMovingRange).toBeCloseTo(16.9 / 9, 12);
    expect(chart.upper - chart.mean).toBeCloseTo((3 * (16.9 / 9)) / 1.128, 12);
    // MR chart limit D4·MR-bar, D4 = 3.267 for ranges of two (control-chart constants, from memory).
    expect(chart.movingRangeUpper).toBeCloseTo(3.267 * (16.9 / 9), 12);
    expect(D2_MOVING_RANGE_OF_TWO).toBe(1.128);
    expect(D4_MOVING_RANGE_OF_TWO).toBe(3.267);
  });

  it("flags a reading outside the limits and a jump in the moving range", () => {
    const chart = computeIndividualsChart([10, 10.1, 9.9, 10, 10.1, 9.9, 10, 14]);
    expect(chart.signals).toEqual([7]);
    expect(chart.movingRangeSignals).toEqual([7]);
  });

  it("refuses fewer than two readings and non-numbers", () => {
    expectFieldError(() => computeIndividualsChart([1]), "values");
    expectFieldError(() => computeIndividualsChart([1, Number.NaN, 3]), "values[1]");
  });

  it("moves with a shift of every reading and keeps symmetric limits (property)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1000, max: 1000, noNaN: true }), { minLength: 2, maxLength: 40 }),
        fc.double({ min: -1000, max: 1000, noNaN: true }),
        (xs, shift) => {
          const a = computeIndividualsChart(xs);
          const b = computeIndividualsChart(xs.map((x) => x + shift));
          expect(b.mean).toBeCloseTo(a.mean + shift, 6);
          expect(b.averageMovingRange).toBeCloseTo(a.averageMovingRange, 6);
          expect(a.upper - a.mean).toBeCloseTo(a.mean - a.lower, 6);
        },
      ),
    );
  });
});

describe("computeEwma", () => {
  // NIST/SEMATECH e-Handbook 6.3.2.4 worked example, recalled from memory and corroborated
  // against public copies of the page: 20 readings, EWMA0 = target = 50, s = 2.0539 (from the
  // page's historical data), λ = 0.3, L = 3; printed EWMA (2 decimals, EWMA0 = 50.00 omitted);
  // asymptotic limits UCL = 52.5884, LCL = 47.4115; every EWMA in control.
  const data = [52.0, 47.0, 53.0, 49.3, 50.1, 47.0, 51.0, 50.1, 51.2, 50.5,
    49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1];
  const printedEwma = [50.60, 49.52, 50.56, 50.18, 50.16, 49.21, 49.75, 49.85, 50.26, 50.33,
    50.11, 49.36, 49.52, 50.05, 49.38, 49.92, 50.73, 51.23, 51.94, 51.99];
  const nist = { values: data, target: 50, sigma: 2.0539, lambda: 0.3, width: 3 };

  it("reproduces the handbook's EWMA series", () => {
    const result = computeEwma(nist);
    expect(result.ewma).toHaveLength(20);
    result.ewma.forEach((z, i) => expectPrinted(z, printedEwma[i], 2));
  });

  it("approaches the handbook's asymptotic limits and finds the process in control", () => {
    const result = computeEwma(nist);
    // After 20 readings (1 − 0.7^40) differs from 1 by 6e-7: the limits are the asymptotic ones.
    // The page rounds √(λ/(2 − λ)) to 0.4201 before multiplying, so its LCL sits one unit of the
    // fourth decimal below the exact 47.41157: allow 1e-4.
    expect(Math.abs(result.upper[19] - 52.5884)).toBeLessThanOrEqual(1e-4);
    expect(Math.abs(result.lower[19] - 47.4115)).toBeLessThanOrEqual(1e-4);
    expect(result.signals).toEqual([]);
  });

  it("matches the closed form z_t = (1−λ)^t·z0 + Σ λ(1−λ)^(t−j)·x_j computed independently", () => {
    const result = computeEwma(nist);
    data.forEach((_, i) => {
      const t = i + 1;
      let z = Math.pow(0.7, t) * 50;
      for (let j = 1; j <= t; j++) z += 0.3 * Math.pow(0.7, t - j) * data[j - 1];
      expect(result.ewma[i]).toBeCloseTo(z, 10);
    });
    // At t = 1 the variance factor λ/(2−λ)·(1 − (1−λ)²) is exactly λ²: limits target ± L·σ·λ.
    expect(result.upper[0]).toBeCloseTo(50 + 3 * 2.0539 * 0.3, 12);
    expect(result.lower[0]).toBeCloseTo(50 - 3 * 2.0539 * 0.3, 12);
  });

  it("has the variance its limits assume (simulation checked with simple-statistics)", () => {
    // Seeded generator so the check is repeatable; 20,000 series give about 1 % error on a variance.
    let state = 12345;
    const uniform = (): number => {
      state = (state + 0x6d2b79f5) | 0;
      let t = Math.imul(state ^ (state >>> 15), 1 | state);
      t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
      return (((t ^ (t >>> 14)) >>> 0) + 0.5) / 4294967296;
    };
    const normal = (): number => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
    const lambda = 0.3;
    const third: number[] = [];
    for (let n = 0; n < 20000; n++) {
      const r = computeEwma({ values: [normal(), normal(), normal()], target: 0, sigma: 1, lambda, width: 1 });
      third.push(r.ewma[2]);
    }
    const expected = (lambda / (2 - lambda)) * (1 - Math.pow(1 - lambda, 6));
    const limits = computeEwma({ values: [0, 0, 0], target: 0, sigma: 1, lambda, width: 1 });
    expect(limits.upper[2] ** 2).toBeCloseTo(expected, 12);
    expect(Math.abs(sampleVariance(third) / expected - 1)).toBeLessThan(0.05);
    expect(Math.abs(mean(third))).toBeLessThan(0.02);
  });

  it("defaults λ to 0.3 and L to 3", () => {
    const a = computeEwma({ values: data, target: 50, sigma: 2.0539 });
    const b = computeEwma(nist);
    expect(a.ewma).toEqual(b.ewma);
    expect(a.upper).toEqual(b.upper);
  });

  it("lists 0-based indexes of signals and of readings outside the tolerance band", () => {
    const r = computeEwma({ values: [23.2, 23.6, 24.1, 22.0, 22.0], target: 23.6, sigma: 0.15, tolerance: 0.4 });
    // 23.2 sits exactly on the 0.4 edge and is inside; 24.1 and the 22.0s are outside.
    expect(r.outOfTolerance).toEqual([2, 3, 4]);
    // z: 23.48, 23.516, 23.6912, 23.18384, 22.828688 against limits ±0.135, ±0.1648, ...
    expect(r.signals).toEqual([3, 4]);
    expect(computeEwma({ values: [1], target: 1, sigma: 1 }).outOfTolerance).toBeUndefined();
  });

  it("refuses bad input, naming the field", () => {
    expectFieldError(() => computeEwma({ values: [], target: 0, sigma: 1 }), "values");
    expectFieldError(() => computeEwma({ values: [1, 2, Number.NaN], target: 0, sigma: 1 }), "values[2]");
    expectFieldError(() => computeEwma({ values: [1], target: Number.NaN, sigma: 1 }), "target");
    expectFieldError(() => computeEwma({ values: [1], target: 0, sigma: 0 }), "sigma");
    expectFieldError(() => computeEwma({ values: [1], target: 0, sigma: -2 }), "sigma");
    expectFieldError(() => computeEwma({ values: [1], target: 0, sigma: 1, lambda: 0 }), "lambda");
    expectFieldError(() => computeEwma({ values: [1], target: 0, sigma: 1, lambda: 1.01 }), "lambda");
    expectFieldError(() => computeEwma({ values: [1], target: 0, sigma: 1, lambda: Number.NaN }), "lambda");
    expectFieldError(() => computeEwma({ values: [1], target: 0, sigma: 1, width: 0 }), "width");
    expectFieldError(() => computeEwma({ values: [1], target: 0, sigma: 1, tolerance: -1 }), "tolerance");
    expectFieldError(() => computeEwma({ values: [1e308, 1e308], target: -1e308, sigma: 1e308 }), "values");
  });

  const target = fc.double({ min: -1e4, max: 1e4, noNaN: true });
  const sigma = fc.double({ min: 1e-3, max: 1e3, noNaN: true });
  const lambda = fc.double({ min: 0.01, max: 1, noNaN: true });
  const width = fc.double({ min: 0.5, max: 6, noNaN: true });

  it("never signals on a constant series at target (property)", () => {
    fc.assert(
      fc.property(target, sigma, lambda, width, fc.integer({ min: 1, max: 60 }), (t, s, l, w, n) => {
        const r = computeEwma({ values: Array(n).fill(t), target: t, sigma: s, lambda: l, width: w, tolerance: 0 });
        expect(r.signals).toEqual([]);
        expect(r.outOfTolerance).toEqual([]);
      }),
    );
  });

  it("widens its limits monotonically toward the asymptote (property)", () => {
    fc.assert(
      fc.property(target, sigma, lambda, width, fc.integer({ min: 1, max: 80 }), (t, s, l, w, n) => {
        const r = computeEwma({ values: Array(n).fill(t), target: t, sigma: s, lambda: l, width: w });
        const asymptote = w * s * Math.sqrt(l / (2 - l));
        const slack = 1e-9 * asymptote;
        for (let i = 0; i < n; i++) {
          const half = r.upper[i] - t;
          expect(half).toBeGreaterThan(0);
          expect(half).toBeLessThanOrEqual(asymptote + slack);
          expect(t - r.lower[i]).toBeCloseTo(half, 6);
          if (i > 0) expect(half).toBeGreaterThanOrEqual(r.upper[i - 1] - t - slack);
        }
      }),
    );
  });

  it("equals the readings when λ = 1 (property)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 40 }),
        target,
        sigma,
        (xs, t, s) => {
          const z = computeEwma({ values: xs, target: t, sigma: s, lambda: 1 }).ewma;
          // === rather than toEqual: a reading of −0 comes back as 0, the same number.
          expect(z).toHaveLength(xs.length);
          expect(z.every((v, i) => v === xs[i])).toBe(true);
        },
      ),
    );
  });

  it("stays within the range of the target and the readings (property)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e4, max: 1e4, noNaN: true }), { minLength: 1, maxLength: 40 }),
        target,
        lambda,
        (xs, t, l) => {
          const lo = Math.min(t, ...xs) - 1e-6;
          const hi = Math.max(t, ...xs) + 1e-6;
          for (const z of computeEwma({ values: xs, target: t, sigma: 1, lambda: l }).ewma) {
            expect(z).toBeGreaterThanOrEqual(lo);
            expect(z).toBeLessThanOrEqual(hi);
          }
        },
      ),
    );
  });
});

describe("computeCusum", () => {
  // NIST/SEMATECH e-Handbook 6.3.2.3 tabular CUSUM example, recalled from memory and
  // corroborated against public copies of the page: target 325, k = 0.3175, h = 4.1959 (data
  // units; k = σ/2 with σ = 0.635). The page prints the group means to two decimals, but its
  // x − 325 and cumulative-sum columns (e.g. group 7: −0.88 and −1.62 beside 324.13) show that
  // the means carry a third decimal (324.125), which is what is charted here.
  const data = [324.925, 324.675, 324.725, 324.350, 325.350, 325.225, 324.125, 324.525,
    325.225, 324.600, 324.625, 325.150, 328.325, 327.250, 327.825, 328.500,
    326.675, 327.775, 326.875, 328.350];
  // Printed columns (2 decimals): S_hi, S_lo, cumulative sum of x − 325.
  const printedHigh = [0.00, 0.00, 0.00, 0.00, 0.03, 0.00, 0.00, 0.00, 0.00, 0.00,
    0.00, 0.00, 3.01, 4.94, 7.45, 10.63, 11.99, 14.44, 16.00, 19.04];
  const printedLow = [0.00, 0.01, 0.00, 0.33, 0.00, 0.00, 0.56, 0.72, 0.17, 0.25,
    0.31, 0.00, 0.00, 0.00, 0.00, 0.00, 0.00, 0.00, 0.00, 0.00];
  const printedCusum = [-0.07, -0.40, -0.67, -1.32, -0.97, -0.75, -1.62, -2.10, -1.87, -2.27,
    -2.65, -2.50, 0.83, 3.08, 5.90, 9.40, 11.08, 13.85, 15.73, 19.08];

  it("reproduces the handbook's tabular CUSUM", () => {
    const r = computeCusum({ values: data, target: 325, k: 0.3175, h: 4.1959 });
    r.upper.forEach((s, i) => expectPrinted(s, printedHigh[i], 2));
    r.lower.forEach((s, i) => expectPrinted(s, printedLow[i], 2));
    r.cusum.forEach((s, i) => expectPrinted(s, printedCusum[i], 2));
  });

  it("signals from group 14 (index 13) on the upper side, as the handbook stars them", () => {
    const r = computeCusum({ values: data, target: 325, k: 0.3175, h: 4.1959 });
    expect(r.signalsHigh).toEqual([13, 14, 15, 16, 17, 18, 19]);
    expect(r.signalsLow).toEqual([]);
    expect(r.signals).toEqual(r.signalsHigh);
  });

  it("ends its plain cumulative sum at Σx − n·target (simple-statistics)", () => {
    const r = computeCusum({ values: data, target: 325, k: 0.3175, h: 4.1959 });
    expect(r.cusum[19]).toBeCloseTo(sum(data) - 20 * 325, 9);
  });

  it("signals a downward shift on the lower side", () => {
    const r = computeCusum({ values: [10, 9, 9, 9, 9], target: 10, k: 0.25, h: 2 });
    // S_lo: 0, 0.75, 1.5, 2.25, 3.0
    expect(r.lower).toEqual([0, 0.75, 1.5, 2.25, 3]);
    expect(r.signalsLow).toEqual([3, 4]);
  });

  it("refuses bad input, naming the field", () => {
    expectFieldError(() => computeCusum({ values: [], target: 0, k: 0.5, h: 4 }), "values");
    expectFieldError(() => computeCusum({ values: [1], target: 0, k: -0.5, h: 4 }), "k");
    expectFieldError(() => computeCusum({ values: [1], target: 0, k: 0.5, h: 0 }), "h");
    expectFieldError(() => computeCusum({ values: [1, Number.POSITIVE_INFINITY], target: 0, k: 0.5, h: 4 }), "values[1]");
  });

  it("keeps both one-sided sums non-negative (property)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e4, max: 1e4, noNaN: true }), { minLength: 1, maxLength: 40 }),
        fc.double({ min: -1e4, max: 1e4, noNaN: true }),
        fc.double({ min: 0, max: 10, noNaN: true }),
        (xs, t, k) => {
          const r = computeCusum({ values: xs, target: t, k, h: 5 });
          r.upper.forEach((s) => expect(s).toBeGreaterThanOrEqual(0));
          r.lower.forEach((s) => expect(s).toBeGreaterThanOrEqual(0));
        },
      ),
    );
  });
});
