import { convertCrankingToElevation } from "../cranking";
import { computeEwma } from "../drift";
import {
  buildSignal,
  formatCc,
  formatElevation,
  formatKpaWithPsi,
  formatLimitMm,
  formatLimitPct,
  formatMm,
  formatPct,
  reaches,
  exceeds,
} from "./format";
import type { CylinderReading, DriftMetric, ReadingSet, Severity, Signal, SignalThresholds } from "./types";

// Drift of one cylinder's metric from its baseline, judged two ways:
//  - a fixed tolerance on the latest reading (the team's watch / act levels), and
//  - an EWMA chart of every reading since the baseline, with the reading's noise as sigma.
// Severity: act when the act tolerance is reached, or when the watch tolerance is reached and
// the EWMA confirms a sustained shift the same way; watch when only one of the two says so.

type Direction = "down" | "up";

interface Point {
  value: number;
  set: ReadingSet;
  cylinder: CylinderReading;
}

interface FixedLevel {
  severity: Severity | null;
  direction: Direction | null;
}

interface MetricRule {
  metric: DriftMetric;
  label: string;
  /** Unit suffix for the numbers' names. */
  unit: "Cc" | "Mm" | "Kpa" | "Pct";
  valueName: string;
  pick(c: CylinderReading): number | null;
  sigma(baseline: number, t: SignalThresholds): number;
  /** Directions in which a sustained EWMA shift matters. */
  ewmaDirections: Direction[];
  fixedLevel(baseline: number, latest: number, t: SignalThresholds): FixedLevel;
  /** Readings as people write them; `precise` adds a digit for EWMA statistics. */
  formatValue(value: number, precise?: boolean): string;
  describeChange(baseline: number, latest: number): string;
  limitsText(t: SignalThresholds): string;
}

function level(act: boolean, watch: boolean, direction: Direction): FixedLevel {
  if (act) return { severity: "act", direction };
  if (watch) return { severity: "watch", direction };
  return { severity: null, direction: null };
}

function pctChange(baseline: number, latest: number): number {
  return ((latest - baseline) / baseline) * 100;
}

function describePct(baseline: number, latest: number): string {
  const pct = pctChange(baseline, latest);
  return `${formatPct(Math.abs(pct))} ${pct < 0 ? "below" : "above"}`;
}

function squishRule(
  metric: DriftMetric,
  label: string,
  pick: (s: [number, number]) => number,
  sigmaScale: number,
  decimals: number,
): MetricRule {
  return {
    metric,
    label,
    unit: "Mm",
    valueName: "squishMm",
    pick: (c) => (c.squishMm ? pick(c.squishMm) : null),
    sigma: (_b, t) => t.ewma.squishSigmaMm * sigmaScale,
    ewmaDirections: ["down", "up"],
    fixedLevel(baseline, latest, t) {
      const change = latest - baseline;
      if (change <= 0) {
        return level(reaches(-change, t.squish.actDownMm), reaches(-change, t.squish.watchMm), "down");
      }
      return level(reaches(change, t.squish.actUpMm), reaches(change, t.squish.watchMm), "up");
    },
    formatValue: (v, precise) => formatMm(v, precise ? decimals + 1 : decimals),
    describeChange: (b, l) => `${formatMm(Math.abs(l - b))} ${l < b ? "below" : "above"}`,
    limitsText: (t) =>
      `watch at ±${formatLimitMm(t.squish.watchMm)}, act at −${formatLimitMm(t.squish.actDownMm)} ` +
      `or +${formatLimitMm(t.squish.actUpMm)}`,
  };
}

const RULES: MetricRule[] = [
  {
    metric: "chamber",
    label: "chamber volume",
    unit: "Cc",
    valueName: "chamberCc",
    pick: (c) => (c.chamberUnconfirmed || c.chamberCc == null ? null : c.chamberCc),
    sigma: (_b, t) => t.ewma.chamberSigmaCc,
    // A larger chamber lowers compression; the table watches the drop that carbon brings.
    ewmaDirections: ["down"],
    fixedLevel(baseline, latest, t) {
      const drop = -pctChange(baseline, latest);
      return level(reaches(drop, t.chamber.actDropPct), reaches(drop, t.chamber.watchDropPct), "down");
    },
    formatValue: (v, precise) => formatCc(v, precise ? 2 : 1),
    describeChange: describePct,
    limitsText: (t) => `watch at −${formatLimitPct(t.chamber.watchDropPct)}, act at −${formatLimitPct(t.chamber.actDropPct)}`,
  },
  squishRule("squish-a", "squish on side A", (s) => s[0], 1, 2),
  squishRule("squish-b", "squish on side B", (s) => s[1], 1, 2),
  // The mean of two sides carries 1/√2 of one reading's noise, and a third decimal.
  squishRule("squish-mean", "mean squish", (s) => (s[0] + s[1]) / 2, Math.SQRT1_2, 3),
  {
    metric: "cranking",
    label: "cranking pressure",
    unit: "Kpa",
    valueName: "correctedKpa",
    pick: (c) => (c.crankingKpa == null ? null : c.crankingKpa),
    sigma: (b, t) => (t.ewma.crankingSigmaPct / 100) * b,
    ewmaDirections: ["down", "up"],
    fixedLevel(baseline, latest, t) {
      const pct = pctChange(baseline, latest);
      if (pct <= 0) {
        return level(reaches(-pct, t.cranking.actDropPct), reaches(-pct, t.cranking.watchDropPct), "down");
      }
      return level(reaches(pct, t.cranking.actRisePct), reaches(pct, t.cranking.watchRisePct), "up");
    },
    formatValue: (v) => formatKpaWithPsi(v),
    describeChange: describePct,
    limitsText: (t) =>
      `watch at −${formatLimitPct(t.cranking.watchDropPct)} or +${formatLimitPct(t.cranking.watchRisePct)}, ` +
      `act at −${formatLimitPct(t.cranking.actDropPct)} or +${formatLimitPct(t.cranking.actRisePct)}`,
  },
  {
    metric: "leakdown",
    label: "leak-down",
    unit: "Pct",
    valueName: "leakdownPct",
    pick: (c) => (c.leakdownPct == null ? null : c.leakdownPct),
    sigma: (_b, t) => t.ewma.leakdownSigmaPoints,
    ewmaDirections: ["up"],
    fixedLevel(baseline, latest, t) {
      const points = latest - baseline;
      return level(
        exceeds(latest, t.leakdown.actPct) || reaches(points, t.leakdown.actPoints),
        exceeds(latest, t.leakdown.watchPct) || reaches(points, t.leakdown.watchPoints),
        "up",
      );
    },
    formatValue: (v, precise) => formatPct(v, precise ? 2 : 1),
    describeChange: (b, l) => `${formatPct(Math.abs(l - b)).replace(" %", "")} points ${l < b ? "below" : "above"}`,
    limitsText: (t) =>
      `watch above ${formatLimitPct(t.leakdown.watchPct)} or at +${t.leakdown.watchPoints} points, ` +
      `act above ${formatLimitPct(t.leakdown.actPct)} or at +${t.leakdown.actPoints} points`,
  },
];

function findCylinder(set: ReadingSet, cylinder: number): CylinderReading | undefined {
  return set.cylinders.find((c) => c.cylinder === cylinder);
}

// Cranking is carried to the baseline's elevation so that thinner air at an event does not
// read as wear; every other metric is compared as read.
function comparableValue(rule: MetricRule, c: CylinderReading, set: ReadingSet, baseline: ReadingSet): number | null {
  const raw = rule.pick(c);
  if (raw === null) return null;
  if (rule.metric !== "cranking") return raw;
  return convertCrankingToElevation(raw, set.elevationM, baseline.elevationM);
}

function evaluateRule(
  rule: MetricRule,
  engineId: string,
  engineName: string,
  cylinder: number,
  baselineSet: ReadingSet,
  readings: ReadingSet[],
  t: SignalThresholds,
): Signal | null {
  const baseCylinder = findCylinder(baselineSet, cylinder);
  const baseline = baseCylinder ? rule.pick(baseCylinder) : null;
  if (baseline === null) return null;
  const points: Point[] = [];
  for (const set of readings) {
    const c = findCylinder(set, cylinder);
    const value = c ? comparableValue(rule, c, set, baselineSet) : null;
    if (c && value !== null) points.push({ value, set, cylinder: c });
  }
  if (points.length === 0) return null;
  const latest = points[points.length - 1];

  const fixed = rule.fixedLevel(baseline, latest.value, t);
  const chart = computeEwma({
    values: points.map((p) => p.value),
    target: baseline,
    sigma: rule.sigma(baseline, t),
    lambda: t.ewma.lambda,
    width: t.ewma.width,
  });
  const last = points.length - 1;
  const z = chart.ewma[last];
  const ewmaDirection: Direction | null = z > chart.upper[last] ? "up" : z < chart.lower[last] ? "down" : null;
  const ewmaCounts = ewmaDirection !== null && rule.ewmaDirections.includes(ewmaDirection);

  let severity: Severity | null = fixed.severity;
  if (fixed.severity === "watch" && ewmaCounts && ewmaDirection === fixed.direction) severity = "act";
  if (severity === null && ewmaCounts) severity = "watch";
  if (severity === null) return null;

  const u = rule.unit;
  const numbers: Record<string, number> = {
    [`baseline${u}`]: baseline,
    [rule.valueName]: latest.value,
    [`change${u === "Pct" ? "Points" : u}`]: latest.value - baseline,
    [`ewma${u}`]: z,
    [`ewmaLower${u}`]: chart.lower[last],
    [`ewmaUpper${u}`]: chart.upper[last],
    readingsSinceBaseline: points.length,
  };
  if (u === "Cc" || u === "Kpa") numbers.changePct = pctChange(baseline, latest.value);

  let valueText = rule.formatValue(latest.value);
  if (rule.metric === "cranking") {
    const raw = latest.cylinder.crankingKpa as number;
    numbers.readKpa = raw;
    numbers.readElevationM = latest.set.elevationM;
    numbers.baselineElevationM = baselineSet.elevationM;
    if (latest.set.elevationM !== baselineSet.elevationM) {
      valueText =
        `${formatKpaWithPsi(raw)} as read at ${formatElevation(latest.set.elevationM)}, which is ` +
        `${formatKpaWithPsi(latest.value)} at the baseline's ${formatElevation(baselineSet.elevationM)}`;
    }
  }
  if (latest.set.engineHours !== undefined) numbers.engineHours = latest.set.engineHours;

  let message =
    `${engineName}, cylinder ${cylinder}: ${rule.label} is ${valueText}, ` +
    `${rule.describeChange(baseline, latest.value)} its baseline of ${rule.formatValue(baseline)} ` +
    `(${rule.limitsText(t)}).`;
  if (ewmaCounts) {
    const side = ewmaDirection === "down" ? "below its lower" : "above its upper";
    const limit = ewmaDirection === "down" ? chart.lower[last] : chart.upper[last];
    const over = points.length === 1 ? "the first reading" : `the ${points.length} readings`;
    message +=
      ` The EWMA over ${over} since baseline, ${rule.formatValue(z, true)}, is ${side} control limit ` +
      `${rule.formatValue(limit, true)}: a sustained change, beyond reading noise.`;
  }
  return buildSignal({ kind: "drift", severity, engineId, cylinder, metric: rule.metric, numbers, message });
}

/** Drift signals for every cylinder and metric that has a baseline and a later reading. */
export function evaluateDrift(
  engineId: string,
  engineName: string,
  cylinderCount: number,
  baseline: ReadingSet,
  readings: ReadingSet[],
  t: SignalThresholds,
): Signal[] {
  const signals: Signal[] = [];
  for (let cylinder = 1; cylinder <= cylinderCount; cylinder++) {
    for (const rule of RULES) {
      const signal = evaluateRule(rule, engineId, engineName, cylinder, baseline, readings, t);
      if (signal) signals.push(signal);
    }
  }
  return signals;
}
