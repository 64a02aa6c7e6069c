// The shapes the signal rules read and write. Units are in the names: Cc, Mm, Kpa (gauge for
// cranking), Pct, M (geometric elevation above sea level).

export type Severity = "watch" | "act";

export type SignalKind =
  | "due-soon"
  | "overdue"
  | "drift"
  | "spread"
  | "squish-sides"
  | "unconfirmed"
  | "class-rule";

/** Per-cylinder quantities compared with the baseline. */
export type DriftMetric = "chamber" | "squish-a" | "squish-b" | "squish-mean" | "cranking" | "leakdown";

/** Quantities compared between the cylinders of one reading set. */
export type SpreadMetric = "chamber" | "squish" | "cranking";

export interface Signal {
  /**
   * Stable identity of the condition: engine, kind, cylinder ("engine" when none) and metric.
   * Severity is not part of it, so a condition that worsens keeps its key; the kind is, so a
   * due-soon interval that becomes overdue opens an overdue signal and the due-soon one clears.
   */
  key: string;
  kind: SignalKind;
  severity: Severity;
  engineId: string;
  /** 1-based cylinder number, for per-cylinder conditions. */
  cylinder?: number;
  /** The drift/spread metric, or the usage counter's id for due-soon and overdue. */
  metric?: string;
  /** The numbers that raised the signal, every one finite, units in the names. */
  numbers: Record<string, number>;
  /** Plain English with units, ready for a mail or the inbox. */
  message: string;
}

export interface CylinderReading {
  /** 1-based cylinder number. */
  cylinder: number;
  /** Accepted installed chamber volume, cc; null when none was accepted. */
  chamberCc?: number | null;
  /** True when the repeated chamber readings never agreed (then chamberCc is not used). */
  chamberUnconfirmed?: boolean;
  /** The repeated burette readings, cc, shown when they never agreed. */
  chamberReadingsCc?: number[];
  /** Squish clearance on each side of the pin axis, mm: [side A, side B]. */
  squishMm?: [number, number] | null;
  /** Cranking pressure as the gauge read it (gauge, not absolute), kPa. */
  crankingKpa?: number | null;
  /** Leak-down loss, % of the input pressure. */
  leakdownPct?: number | null;
}

export interface ReadingSet {
  /** Optional identity for the caller's own bookkeeping. */
  id?: string;
  /** Geometric elevation where the set was taken, m (−500…9000). */
  elevationM: number;
  /** Engine hours when the set was taken (informational, shown in messages). */
  engineHours?: number;
  cylinders: CylinderReading[];
}

/** Usage units: hours, litres of fuel, kilometres, laps. */
export type UsageUnit = "h" | "L" | "km" | "laps";

export interface UsageCounter {
  /** Stable id of the interval (e.g. "top-end", "bottom-end", "part:123"); goes into the key. */
  id: string;
  /** What people call it: "top end", "crank", "piston, cylinder 2". */
  label: string;
  scope: "engine" | "part";
  /** What the interval renews. */
  span: "top-end" | "bottom-end" | "other";
  /** Usage since the last renewal, in `unit`. */
  used: number;
  /** Usage at which the interval is due, in `unit`. */
  limit: number;
  unit: UsageUnit;
}

export interface PlannedEventUsage {
  name: string;
  /** Engine hours the event is expected to add. */
  expectedHours?: number;
  /** Fuel the event is expected to burn, litres (for counters kept in litres). */
  expectedLitres?: number;
  /** Expected usage in any unit, for counters kept in kilometres or laps (or as a general fallback). */
  expectedUsage?: number;
}

export interface ClassLimits {
  className: string;
  /** Minimum squish: the mean of the two sides counts. */
  minSquishMm?: number;
  /** Minimum installed chamber volume. */
  minChamberCc?: number;
}

/**
 * Everything the rules need about one engine. Readings are compared with `baseline`; the
 * "current" value of a cylinder's metric is the latest one measured (a set that skipped a
 * measurement neither clears nor raises a condition on it). Spread between cylinders uses the
 * latest set that measured the metric on at least two cylinders, which is the baseline itself
 * when nothing was read since.
 */
export interface EngineSignalInput {
  engineId: string;
  engineName: string;
  cylinderCount: number;
  /** Fraction of an interval at which it is due soon; default from the thresholds (0.8). */
  planningFraction?: number;
  usage?: UsageCounter[];
  /** The next event the engine is planned for, with the usage it is expected to add. */
  nextEvent?: PlannedEventUsage | null;
  /** The reading set taken after break-in that later sets are compared with. */
  baseline?: ReadingSet | null;
  /** Reading sets taken since the baseline, oldest first. */
  readings?: ReadingSet[];
  classLimits?: ClassLimits | null;
}

export interface SignalThresholds {
  /** Shown beside every default so nobody mistakes it for a specification. */
  provenance: string;
  usage: { planningFraction: number };
  /** Installed chamber volume against baseline: a drop at or beyond these percentages. */
  chamber: { watchDropPct: number; actDropPct: number };
  /** Between cylinders, as % of the largest: above watchPct; above actCc or actPct. */
  chamberSpread: { watchPct: number; actPct: number; actCc: number };
  /** Squish against baseline, each side and the mean: ±watch; act down or up. */
  squish: { watchMm: number; actDownMm: number; actUpMm: number };
  /** Difference between the two sides of one cylinder: above these. */
  squishSides: { watchMm: number; actMm: number };
  /** Mean squish between cylinders: above these. */
  squishSpread: { watchMm: number; actMm: number };
  /** Cranking against baseline after conversion to the baseline's elevation. */
  cranking: { watchDropPct: number; actDropPct: number; watchRisePct: number; actRisePct: number };
  /** Between cylinders, as % of the highest: above these. */
  crankingSpread: { watchPct: number; actPct: number };
  /** Leak-down: above an absolute level, or a rise of at least so many points. */
  leakdown: { watchPct: number; actPct: number; watchPoints: number; actPoints: number };
  /** EWMA chart of the readings since baseline; sigmas are one reading's noise. */
  ewma: {
    lambda: number;
    width: number;
    chamberSigmaCc: number;
    squishSigmaMm: number;
    /** As % of the baseline reading. */
    crankingSigmaPct: number;
    leakdownSigmaPoints: number;
  };
}

type ThresholdGroups = Omit<SignalThresholds, "provenance">;

/** Per-organisation or per-engine edits: any group, any field. */
export type SignalThresholdOverrides = { provenance?: string } & {
  [G in keyof ThresholdGroups]?: Partial<ThresholdGroups[G]>;
};

export interface ReconcileResult {
  /** Conditions not already open: open them (and mail). */
  toOpen: Signal[];
  /** Open keys whose condition has cleared: resolve them automatically. */
  toAutoResolve: string[];
  /** Open keys whose condition persists: raise nothing new. */
  unchanged: string[];
  /** Persisting conditions that went from watch to act (their keys are also in `unchanged`). */
  escalated: Signal[];
}
