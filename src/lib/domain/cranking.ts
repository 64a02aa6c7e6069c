import { MAX_ELEVATION_M, MIN_ELEVATION_M, standardAtmosphere } from "./atmosphere";
import { DomainInputError } from "./errors";
import { requireFinite, requireInRange, requireNonNegative, requirePositive } from "./input-guards";

// Cranking pressure as a polytropic compression of the trapped charge from ambient pressure:
//   p_abs ≈ p_ambient · rc^n,   gauge = p_abs − p_ambient
// (a gauge reads against the air around it, so at altitude it subtracts the local pressure).

/**
 * n = 1.3, the exponent of the worked example in Wikipedia, "Compression ratio", dynamic
 * compression ratio section (rc 7.5, 14.7 psi → 201.8 psia). A team's own fit replaces it.
 */
export const DEFAULT_POLYTROPIC_EXPONENT = 1.3;
/**
 * A fitted exponent is an effective one: gauge hose dead volume and cranking speed fold into
 * it, so it may leave the physical 1.0–1.4 band; outside 0.5–2 the readings are not a gauge's.
 */
export const MIN_POLYTROPIC_EXPONENT = 0.5;
export const MAX_POLYTROPIC_EXPONENT = 2;

export interface CrankingEstimate {
  absoluteKpa: number;
  gaugeKpa: number;
}

function requireRatio(field: string, ratio: number): number {
  const r = requireFinite(field, ratio);
  if (r < 1) throw new DomainInputError(field, `${field} must be at least 1`);
  return r;
}

export function estimateCrankingKpa(
  ambientKpa: number,
  trappedRatio: number,
  n: number = DEFAULT_POLYTROPIC_EXPONENT,
): CrankingEstimate {
  const ambient = requirePositive("ambientKpa", ambientKpa);
  const ratio = requireRatio("trappedRatio", trappedRatio);
  const exponent = requireInRange("polytropicExponent", n, MIN_POLYTROPIC_EXPONENT, MAX_POLYTROPIC_EXPONENT);
  const absoluteKpa = ambient * ratio ** exponent;
  return { absoluteKpa, gaugeKpa: absoluteKpa - ambient };
}

export interface CrankingSample {
  /** Absolute ambient pressure where the reading was taken, kPa. */
  ambientKpa: number;
  /** Trapped (two-stroke) or effective compression ratio of the engine at the time. */
  ratio: number;
  /** The gauge reading, kPa. */
  gaugeKpa: number;
}

export interface ExponentFit {
  n: number;
  /** Root-mean-square of (estimated − read) gauge pressure over the samples, kPa. */
  rmsErrorKpa: number;
}

function sumSquaredErrors(samples: readonly CrankingSample[], n: number): number {
  return samples.reduce((sum, s) => {
    const residual = s.ambientKpa * s.ratio ** n - s.ambientKpa - s.gaugeKpa;
    return sum + residual * residual;
  }, 0);
}

// Half the derivative of the sum of squares with respect to n.
function slopeOfErrors(samples: readonly CrankingSample[], n: number): number {
  return samples.reduce((sum, s) => {
    const predictedAbs = s.ambientKpa * s.ratio ** n;
    return sum + (predictedAbs - s.ambientKpa - s.gaugeKpa) * predictedAbs * Math.log(s.ratio);
  }, 0);
}

const SCAN_STEPS = 300;

/**
 * Least-squares fit of n to an engine's own gauge readings (in kPa, so the fit weighs the
 * errors the gauge actually shows): the sum of squares is scanned over 0.5–2 for its lowest
 * point, and the zero of its derivative is then bisected to full precision.
 */
export function fitPolytropicExponent(samples: readonly CrankingSample[]): ExponentFit {
  if (samples.length === 0) throw new DomainInputError("samples", "samples needs at least one reading");
  samples.forEach((s, i) => {
    requirePositive(`samples[${i}].ambientKpa`, s.ambientKpa);
    requireRatio(`samples[${i}].ratio`, s.ratio);
    requirePositive(`samples[${i}].gaugeKpa`, s.gaugeKpa);
  });
  if (!samples.some((s) => s.ratio > 1)) {
    throw new DomainInputError("samples", "samples needs a reading from a ratio above 1");
  }

  const step = (MAX_POLYTROPIC_EXPONENT - MIN_POLYTROPIC_EXPONENT) / SCAN_STEPS;
  let bestIndex = 0;
  let bestError = Infinity;
  for (let k = 0; k <= SCAN_STEPS; k += 1) {
    const error = sumSquaredErrors(samples, MIN_POLYTROPIC_EXPONENT + k * step);
    if (error < bestError) {
      bestError = error;
      bestIndex = k;
    }
  }
  if (bestIndex === 0 || bestIndex === SCAN_STEPS) {
    throw new DomainInputError(
      "samples",
      "these readings imply an exponent outside 0.5–2: check the gauge, its hose and the ratios",
    );
  }

  let lo = MIN_POLYTROPIC_EXPONENT + (bestIndex - 1) * step;
  let hi = MIN_POLYTROPIC_EXPONENT + (bestIndex + 1) * step;
  for (let k = 0; k < 200 && hi - lo > 1e-15; k += 1) {
    const mid = (lo + hi) / 2;
    if (slopeOfErrors(samples, mid) > 0) hi = mid;
    else lo = mid;
  }
  const n = (lo + hi) / 2;
  return { n, rmsErrorKpa: Math.sqrt(sumSquaredErrors(samples, n) / samples.length) };
}

/**
 * Carries a gauge reading between ambient pressures. Under p_abs = p_amb·rc^n the gauge
 * reading p_amb·(rc^n − 1) is proportional to the absolute ambient pressure just as the
 * absolute cylinder pressure is, so scaling the gauge reading by the ratio of absolute
 * ambient pressures is exact within the model: no gauge-to-absolute step is needed, and
 * adding ambient, scaling and subtracting the new ambient gives the same number.
 */
export function convertCrankingBetweenAmbients(
  readingKpaGauge: number,
  fromAmbientKpa: number,
  toAmbientKpa: number,
): number {
  const reading = requireNonNegative("readingKpaGauge", readingKpaGauge);
  const from = requirePositive("fromAmbientKpa", fromAmbientKpa);
  const to = requirePositive("toAmbientKpa", toAmbientKpa);
  return (reading * to) / from;
}

/**
 * A gauge reading taken at one elevation expressed at another (for example the shop's, so
 * readings from different venues compare), with standard-atmosphere pressures at both.
 */
export function convertCrankingToElevation(
  readingKpaGauge: number,
  fromElevationM: number,
  toElevationM: number,
): number {
  const from = standardAtmosphere(requireInRange("fromElevationM", fromElevationM, MIN_ELEVATION_M, MAX_ELEVATION_M));
  const to = standardAtmosphere(requireInRange("toElevationM", toElevationM, MIN_ELEVATION_M, MAX_ELEVATION_M));
  return convertCrankingBetweenAmbients(readingKpaGauge, from.pressureKpa, to.pressureKpa);
}
