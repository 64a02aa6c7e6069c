import { DomainInputError } from "./errors";
import { requireFinite, requireNonNegative } from "./input-guards";

// A burette reading is repeated until two agree: the set is accepted when some pair lies
// within the organisation's tolerance, otherwise it stays unconfirmed and says which readings
// stand apart.

/** Default agreement for chamber volume by burette, cc (common practice: a burette in tenths). */
export const DEFAULT_CHAMBER_TOLERANCE_CC = 0.2;

export type ReadingStatus = "confirmed" | "unconfirmed" | "empty";

export interface ReadingAgreement {
  status: ReadingStatus;
  /** Mean of the agreeing pair; present only when confirmed. */
  value?: number;
  /** The agreeing pair in the order taken. */
  agreeingPair?: [number, number];
  /** Their 0-based positions in the input. */
  agreeingIndexes?: [number, number];
  /**
   * Confirmed: the readings farther than the tolerance from the accepted value.
   * Unconfirmed: every reading, since none has a partner.
   */
  disagreeing: number[];
  disagreeingIndexes: number[];
}

// Readings are typed in decimals (23.4, 23.6) whose binary difference can land a hair above
// the tolerance; a margin far below any burette's resolution keeps a 0.2 cc gap at 0.2 cc.
function computeSlack(a: number, b: number): number {
  return 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
}

function agreesWithin(a: number, b: number, tolerance: number): boolean {
  return Math.abs(a - b) <= tolerance + computeSlack(a, b);
}

/**
 * Confirms repeated readings (in the order taken). Among the pairs that agree within
 * `tolerance`, the closest pair wins; on a tie the most recent pair wins (the one whose later
 * reading was taken last, then whose earlier reading was taken last), because a mechanic
 * repeats a reading after fixing a leak or a bubble. The accepted value is the mean of that
 * pair, the way two agreeing burette readings are recorded.
 */
export function confirmReadings(values: readonly number[], tolerance: number): ReadingAgreement {
  const tol = requireNonNegative("tolerance", tolerance);
  values.forEach((v) => requireFinite("values", v));
  if (values.length === 0) return { status: "empty", disagreeing: [], disagreeingIndexes: [] };

  let best: { i: number; j: number; gap: number } | undefined;
  for (let j = 1; j < values.length; j += 1) {
    for (let i = 0; i < j; i += 1) {
      if (!agreesWithin(values[i], values[j], tol)) continue;
      const gap = Math.abs(values[i] - values[j]);
      // Pairs are visited most recent last, so an equal gap (to decimal round-off) replaces.
      if (best === undefined || gap <= best.gap + computeSlack(values[i], values[j])) best = { i, j, gap };
    }
  }

  if (best === undefined) {
    return { status: "unconfirmed", disagreeing: [...values], disagreeingIndexes: values.map((_, k) => k) };
  }
  const { i: first, j: second } = best;
  const pair: [number, number] = [values[first], values[second]];
  const value = (pair[0] + pair[1]) / 2;
  const disagreeingIndexes = values
    .map((v, k) => ({ v, k }))
    .filter(({ v, k }) => k !== first && k !== second && !agreesWithin(v, value, tol))
    .map(({ k }) => k);
  return {
    status: "confirmed",
    value,
    agreeingPair: pair,
    agreeingIndexes: [first, second],
    disagreeing: disagreeingIndexes.map((k) => values[k]),
    disagreeingIndexes,
  };
}

/** Confirms chamber readings with the organisation's tolerance, or the default 0.2 cc. */
export function confirmChamberReadings(valuesCc: readonly number[], toleranceCc?: number): ReadingAgreement {
  if (toleranceCc !== undefined && !(toleranceCc >= 0)) {
    throw new DomainInputError("tolerance", "tolerance must not be negative");
  }
  return confirmReadings(valuesCc, toleranceCc ?? DEFAULT_CHAMBER_TOLERANCE_CC);
}
