import { DomainInputError } from "../errors";
import type { SignalThresholdOverrides, SignalThresholds } from "./types";

export const DEFAULT_THRESHOLDS_PROVENANCE = "common practice / from memory";

/**
 * Organisation defaults (TRADE.md "Drift thresholds per cylinder" and "Measurement noise"):
 * common practice and values from memory, for the team to review. Where the table gives a
 * range (cranking act −15 to −20 %, leak-down act above 15–20 %) the cautious end is used.
 * The table has no row for mean squish between cylinders: it borrows the side-to-side row.
 * Leak-down repeatability is not in the table: one point is from memory.
 */
export const DEFAULT_THRESHOLDS: Readonly<SignalThresholds> = deepFreeze({
  provenance: DEFAULT_THRESHOLDS_PROVENANCE,
  usage: { planningFraction: 0.8 },
  chamber: { watchDropPct: 1.5, actDropPct: 3 },
  chamberSpread: { watchPct: 1, actPct: 1.5, actCc: 0.3 },
  squish: { watchMm: 0.05, actDownMm: 0.1, actUpMm: 0.08 },
  squishSides: { watchMm: 0.08, actMm: 0.15 },
  squishSpread: { watchMm: 0.08, actMm: 0.15 },
  cranking: { watchDropPct: 10, actDropPct: 15, watchRisePct: 8, actRisePct: 12 },
  crankingSpread: { watchPct: 5, actPct: 10 },
  leakdown: { watchPct: 10, actPct: 15, watchPoints: 5, actPoints: 8 },
  ewma: {
    lambda: 0.3,
    width: 3,
    chamberSigmaCc: 0.15,
    squishSigmaMm: 0.02,
    crankingSigmaPct: 4,
    leakdownSigmaPoints: 1,
  },
});

function deepFreeze<T extends object>(value: T): T {
  for (const inner of Object.values(value)) {
    if (inner && typeof inner === "object") deepFreeze(inner as object);
  }
  return Object.freeze(value);
}

// Each act level must sit at or beyond its watch level, or "watch" would never be seen.
const ORDERED_PAIRS: ReadonlyArray<[keyof SignalThresholds, string, string]> = [
  ["chamber", "watchDropPct", "actDropPct"],
  ["chamberSpread", "watchPct", "actPct"],
  ["squish", "watchMm", "actDownMm"],
  ["squish", "watchMm", "actUpMm"],
  ["squishSides", "watchMm", "actMm"],
  ["squishSpread", "watchMm", "actMm"],
  ["cranking", "watchDropPct", "actDropPct"],
  ["cranking", "watchRisePct", "actRisePct"],
  ["crankingSpread", "watchPct", "actPct"],
  ["leakdown", "watchPct", "actPct"],
  ["leakdown", "watchPoints", "actPoints"],
];

/** Defaults with the caller's edits laid over them, checked field by field. */
export function mergeThresholds(overrides?: SignalThresholdOverrides | null): SignalThresholds {
  const merged = JSON.parse(JSON.stringify(DEFAULT_THRESHOLDS)) as SignalThresholds;
  if (!overrides) return merged;
  if (typeof overrides !== "object") {
    throw new DomainInputError("thresholds", "thresholds must be an object");
  }
  for (const [group, fields] of Object.entries(overrides)) {
    if (group === "provenance") {
      if (typeof fields !== "string" || fields.trim() === "") {
        throw new DomainInputError("thresholds.provenance", "thresholds.provenance must be a non-empty label");
      }
      merged.provenance = fields;
      continue;
    }
    if (!(group in merged)) {
      throw new DomainInputError(`thresholds.${group}`, `thresholds.${group} is not a threshold group`);
    }
    if (fields === undefined) continue;
    const target = merged[group as keyof SignalThresholds] as unknown as Record<string, number>;
    for (const [name, value] of Object.entries(fields as Record<string, unknown>)) {
      const field = `thresholds.${group}.${name}`;
      if (!(name in target)) throw new DomainInputError(field, `${field} is not a threshold`);
      if (value === undefined) continue;
      if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
        throw new DomainInputError(field, `${field} must be a number greater than zero`);
      }
      target[name] = value;
    }
  }
  checkThresholds(merged);
  return merged;
}

function checkThresholds(t: SignalThresholds): void {
  if (t.usage.planningFraction > 1) {
    throw new DomainInputError("thresholds.usage.planningFraction", "thresholds.usage.planningFraction must not exceed 1");
  }
  if (t.ewma.lambda > 1) {
    throw new DomainInputError("thresholds.ewma.lambda", "thresholds.ewma.lambda must lie in (0, 1]");
  }
  for (const [group, watch, act] of ORDERED_PAIRS) {
    const g = t[group] as unknown as Record<string, number>;
    if (g[act] < g[watch]) {
      const field = `thresholds.${group}.${act}`;
      throw new DomainInputError(field, `${field} must not be below thresholds.${group}.${watch}`);
    }
  }
}
