import { DomainInputError } from "./errors";

// Control-chart statistics for readings that drift: EWMA with time-varying limits, the tabular
// CUSUM and the individuals / moving-range chart, as the NIST/SEMATECH e-Handbook of
// Statistical Methods defines them in section 6.3.2 (6.3.2.2, 6.3.2.3, 6.3.2.4).
// Every index returned is 0-based and refers to `values`.

/** Bias-correction constant d2 for moving ranges of two (control-chart constants, from memory). */
export const D2_MOVING_RANGE_OF_TWO = 1.128;
/** Upper moving-range factor D4 for ranges of two (control-chart constants, from memory). */
export const D4_MOVING_RANGE_OF_TWO = 3.267;

export const DEFAULT_EWMA_LAMBDA = 0.3;
export const DEFAULT_EWMA_WIDTH = 3;

// Decimal readings sitting exactly on a tolerance edge must not be flagged by binary rounding
// (23.6 − 23.2 is 0.4000000000000021 in doubles).
const EDGE_EPSILON = 1e-9;

export interface EwmaInput {
  /** Readings in time order. */
  values: number[];
  /** The baseline the readings should sit at; also the EWMA's starting value z0. */
  target: number;
  /** Standard deviation of one reading. */
  sigma: number;
  /** Weight of the newest reading, 0 < λ ≤ 1 (default 0.3). */
  lambda?: number;
  /** Control-limit multiple L (default 3). */
  width?: number;
  /** Optional fixed ± band around the target. */
  tolerance?: number;
}

export interface EwmaResult {
  /** ewma[i] is the statistic after reading i (z0 = target is not listed). */
  ewma: number[];
  upper: number[];
  lower: number[];
  /** Indexes of readings whose EWMA lies outside its limits. */
  signals: number[];
  /** Indexes of readings outside target ± tolerance (only when a tolerance is given). */
  outOfTolerance?: number[];
}

export interface CusumInput {
  values: number[];
  target: number;
  /** Reference value k in the readings' units (often half the shift to detect). */
  k: number;
  /** Decision interval h in the readings' units. */
  h: number;
}

export interface CusumResult {
  /** S_hi after each reading. */
  upper: number[];
  /** S_lo after each reading (a non-negative sum of shortfalls). */
  lower: number[];
  /** Plain cumulative sum of (x − target). */
  cusum: number[];
  signalsHigh: number[];
  signalsLow: number[];
  /** Union of both sides, ascending. */
  signals: number[];
}

export interface IndividualsChartResult {
  mean: number;
  /** |x[i] − x[i−1]| for i = 1…n−1 (movingRanges[0] belongs to reading 1). */
  movingRanges: number[];
  averageMovingRange: number;
  upper: number;
  lower: number;
  /** Upper limit of the moving-range chart (its lower limit is 0). */
  movingRangeUpper: number;
  /** Indexes of readings outside the individuals limits. */
  signals: number[];
  /** Indexes of readings whose moving range (with the previous one) exceeds its limit. */
  movingRangeSignals: number[];
}

function requireValues(values: unknown, minCount: number): number[] {
  if (!Array.isArray(values) || values.length < minCount) {
    throw new DomainInputError(
      "values",
      minCount === 1 ? "values must hold at least one reading" : `values must hold at least ${minCount} readings`,
    );
  }
  values.forEach((v, i) => requireNumber(`values[${i}]`, v));
  return values as number[];
}

function requireNumber(field: string, value: unknown): number {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new DomainInputError(field, `${field} must be a finite number`);
  }
  return value;
}

function requirePositiveNumber(field: string, value: unknown): number {
  const n = requireNumber(field, value);
  if (n <= 0) throw new DomainInputError(field, `${field} must be greater than zero`);
  return n;
}

// Readings near Number.MAX_VALUE would overflow in the sums; refuse rather than return Infinity.
function requireFiniteOutputs(arrays: number[][]): void {
  for (const arr of arrays) {
    if (arr.some((v) => !Number.isFinite(v))) {
      throw new DomainInputError("values", "values are too large to chart");
    }
  }
}

/**
 * EWMA chart: z_t = λ·x_t + (1 − λ)·z_{t−1}, z_0 = target, limits
 * target ± L·σ·√(λ/(2 − λ)·(1 − (1 − λ)^{2t})) (NIST/SEMATECH 6.3.2.4 with the exact variance).
 */
export function computeEwma(input: EwmaInput): EwmaResult {
  const values = requireValues(input?.values, 1);
  const target = requireNumber("target", input.target);
  const sigma = requirePositiveNumber("sigma", input.sigma);
  const lambda = input.lambda === undefined ? DEFAULT_EWMA_LAMBDA : requireNumber("lambda", input.lambda);
  if (lambda <= 0 || lambda > 1) {
    throw new DomainInputError("lambda", "lambda must lie in (0, 1]");
  }
  const width = input.width === undefined ? DEFAULT_EWMA_WIDTH : requirePositiveNumber("width", input.width);
  const tolerance = input.tolerance === undefined ? undefined : requireNumber("tolerance", input.tolerance);
  if (tolerance !== undefined && tolerance < 0) {
    throw new DomainInputError("tolerance", "tolerance must not be negative");
  }

  const ewma: number[] = [];
  const upper: number[] = [];
  const lower: number[] = [];
  const signals: number[] = [];
  const asymptoticVariance = lambda / (2 - lambda);
  let z = target;
  values.forEach((x, i) => {
    z = lambda * x + (1 - lambda) * z;
    const t = i + 1;
    const halfWidth = width * sigma * Math.sqrt(asymptoticVariance * (1 - Math.pow(1 - lambda, 2 * t)));
    ewma.push(z);
    upper.push(target + halfWidth);
    lower.push(target - halfWidth);
    if (z > target + halfWidth || z < target - halfWidth) signals.push(i);
  });
  requireFiniteOutputs([ewma, upper, lower]);

  const result: EwmaResult = { ewma, upper, lower, signals };
  if (tolerance !== undefined) {
    result.outOfTolerance = values
      .map((x, i) => (Math.abs(x - target) > tolerance + EDGE_EPSILON ? i : -1))
      .filter((i) => i >= 0);
  }
  return result;
}

/**
 * Tabular CUSUM (NIST/SEMATECH 6.3.2.3): S_hi = max(0, S_hi + x − target − k),
 * S_lo = max(0, S_lo + target − k − x), both from 0; a side signals once its sum exceeds h.
 */
export function computeCusum(input: CusumInput): CusumResult {
  const values = requireValues(input?.values, 1);
  const target = requireNumber("target", input.target);
  const k = requireNumber("k", input.k);
  if (k < 0) throw new DomainInputError("k", "k must not be negative");
  const h = requirePositiveNumber("h", input.h);

  const upper: number[] = [];
  const lower: number[] = [];
  const cusum: number[] = [];
  const signalsHigh: number[] = [];
  const signalsLow: number[] = [];
  let sHigh = 0;
  let sLow = 0;
  let sum = 0;
  values.forEach((x, i) => {
    sHigh = Math.max(0, sHigh + x - target - k);
    sLow = Math.max(0, sLow + target - k - x);
    sum += x - target;
    upper.push(sHigh);
    lower.push(sLow);
    cusum.push(sum);
    if (sHigh > h) signalsHigh.push(i);
    if (sLow > h) signalsLow.push(i);
  });
  requireFiniteOutputs([upper, lower, cusum]);
  const signals = [...new Set([...signalsHigh, ...signalsLow])].sort((a, b) => a - b);
  return { upper, lower, cusum, signalsHigh, signalsLow, signals };
}

/**
 * Individuals chart with moving ranges of two (NIST/SEMATECH 6.3.2.2):
 * limits mean ± 3·MR̄/d2 with d2 = 1.128; moving-range limit D4·MR̄.
 */
export function computeIndividualsChart(values: number[]): IndividualsChartResult {
  const xs = requireValues(values, 2);
  const mean = xs.reduce((s, x) => s + x, 0) / xs.length;
  const movingRanges = xs.slice(1).map((x, i) => Math.abs(x - xs[i]));
  const averageMovingRange = movingRanges.reduce((s, r) => s + r, 0) / movingRanges.length;
  const halfWidth = (3 * averageMovingRange) / D2_MOVING_RANGE_OF_TWO;
  const upper = mean + halfWidth;
  const lower = mean - halfWidth;
  const movingRangeUpper = D4_MOVING_RANGE_OF_TWO * averageMovingRange;
  requireFiniteOutputs([[mean, averageMovingRange, upper, lower, movingRangeUpper], movingRanges]);
  const signals = xs.map((x, i) => (x > upper || x < lower ? i : -1)).filter((i) => i >= 0);
  const movingRangeSignals = movingRanges
    .map((r, i) => (r > movingRangeUpper ? i + 1 : -1))
    .filter((i) => i >= 0);
  return { mean, movingRanges, averageMovingRange, upper, lower, movingRangeUpper, signals, movingRangeSignals };
}
