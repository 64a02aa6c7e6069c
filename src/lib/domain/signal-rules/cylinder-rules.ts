import { buildSignal, exceeds, formatCc, formatKpaWithPsi, formatLimitMm, formatLimitPct, formatMm, formatPct } from "./format";
import type { ClassLimits, CylinderReading, ReadingSet, Severity, Signal, SignalThresholds, SpreadMetric } from "./types";

// Rules that read one reading set rather than a trend: spread between cylinders, squish side
// to side, chamber readings that never agreed, and the class rulebook's minimums.

function confirmedChamber(c: CylinderReading): number | null {
  return c.chamberUnconfirmed || c.chamberCc == null ? null : c.chamberCc;
}

function meanSquish(c: CylinderReading): number | null {
  return c.squishMm ? (c.squishMm[0] + c.squishMm[1]) / 2 : null;
}

/** The latest set (newest first) in which `pick` finds a value for the cylinder. */
function latestFor<T>(
  sets: ReadingSet[],
  cylinder: number,
  pick: (c: CylinderReading) => T | null,
): { value: T; set: ReadingSet; reading: CylinderReading } | null {
  for (let i = sets.length - 1; i >= 0; i--) {
    const reading = sets[i].cylinders.find((c) => c.cylinder === cylinder);
    const value = reading ? pick(reading) : null;
    if (reading && value !== null) return { value, set: sets[i], reading };
  }
  return null;
}

interface SpreadRule {
  metric: SpreadMetric;
  label: string;
  unit: "Cc" | "Mm" | "Kpa";
  pick(c: CylinderReading): number | null;
  format(v: number): string;
  judge(spread: number, spreadPct: number, t: SignalThresholds): Severity | null;
  limitsText(t: SignalThresholds): string;
}

const SPREAD_RULES: SpreadRule[] = [
  {
    metric: "chamber",
    label: "chamber volumes",
    unit: "Cc",
    pick: confirmedChamber,
    format: (v) => formatCc(v),
    judge(spread, pct, t) {
      if (exceeds(spread, t.chamberSpread.actCc) || exceeds(pct, t.chamberSpread.actPct)) return "act";
      return exceeds(pct, t.chamberSpread.watchPct) ? "watch" : null;
    },
    limitsText: (t) =>
      `watch above ${formatLimitPct(t.chamberSpread.watchPct)}, act above ` +
      `${t.chamberSpread.actCc} cc or ${formatLimitPct(t.chamberSpread.actPct)}`,
  },
  {
    metric: "squish",
    label: "mean squish",
    unit: "Mm",
    pick: meanSquish,
    format: (v) => formatMm(v),
    judge(spread, _pct, t) {
      if (exceeds(spread, t.squishSpread.actMm)) return "act";
      return exceeds(spread, t.squishSpread.watchMm) ? "watch" : null;
    },
    limitsText: (t) =>
      `watch above ${formatLimitMm(t.squishSpread.watchMm)}, act above ${formatLimitMm(t.squishSpread.actMm)}`,
  },
  {
    // Cylinders of one set were read at one elevation, so the raw gauge readings compare.
    metric: "cranking",
    label: "cranking pressures",
    unit: "Kpa",
    pick: (c) => (c.crankingKpa == null ? null : c.crankingKpa),
    format: (v) => formatKpaWithPsi(v),
    judge(_spread, pct, t) {
      if (exceeds(pct, t.crankingSpread.actPct)) return "act";
      return exceeds(pct, t.crankingSpread.watchPct) ? "watch" : null;
    },
    limitsText: (t) =>
      `watch above ${formatLimitPct(t.crankingSpread.watchPct)}, act above ${formatLimitPct(t.crankingSpread.actPct)}`,
  },
];

function evaluateSpread(engineId: string, engineName: string, sets: ReadingSet[], t: SignalThresholds): Signal[] {
  const signals: Signal[] = [];
  for (const rule of SPREAD_RULES) {
    const set = [...sets].reverse().find((s) => s.cylinders.filter((c) => rule.pick(c) !== null).length >= 2);
    if (!set) continue;
    const values = set.cylinders
      .map((c) => ({ cylinder: c.cylinder, value: rule.pick(c) }))
      .filter((v): v is { cylinder: number; value: number } => v.value !== null)
      .sort((a, b) => a.cylinder - b.cylinder);
    const low = values.reduce((a, b) => (b.value < a.value ? b : a));
    const high = values.reduce((a, b) => (b.value > a.value ? b : a));
    const spread = high.value - low.value;
    // As a share of the largest, the shop habit of "within N % of the highest".
    const spreadPct = high.value > 0 ? (spread / high.value) * 100 : 0;
    const severity = rule.judge(spread, spreadPct, t);
    if (!severity) continue;
    const numbers: Record<string, number> = {
      [`spread${rule.unit}`]: spread,
      spreadPct,
      [`min${rule.unit}`]: low.value,
      [`max${rule.unit}`]: high.value,
      lowCylinder: low.cylinder,
      highCylinder: high.cylinder,
    };
    for (const v of values) numbers[`cylinder${v.cylinder}${rule.unit}`] = v.value;
    const list = values.map((v) => `cylinder ${v.cylinder} ${rule.format(v.value)}`).join(", ");
    signals.push(
      buildSignal({
        kind: "spread",
        severity,
        engineId,
        metric: rule.metric,
        numbers,
        message:
          `${engineName}: ${rule.label} differ by ${rule.format(spread)}, ${formatPct(spreadPct)} of the largest ` +
          `(${list}; ${rule.limitsText(t)}).`,
      }),
    );
  }
  return signals;
}

function evaluateCylinder(
  engineId: string,
  engineName: string,
  cylinder: number,
  sets: ReadingSet[],
  t: SignalThresholds,
  classLimits: ClassLimits | null | undefined,
): Signal[] {
  const signals: Signal[] = [];
  const head = `${engineName}, cylinder ${cylinder}`;

  const squish = latestFor(sets, cylinder, (c) => c.squishMm ?? null);
  if (squish) {
    const [a, b] = squish.value;
    const difference = Math.abs(a - b);
    const severity: Severity | null = exceeds(difference, t.squishSides.actMm)
      ? "act"
      : exceeds(difference, t.squishSides.watchMm)
        ? "watch"
        : null;
    if (severity) {
      signals.push(
        buildSignal({
          kind: "squish-sides",
          severity,
          engineId,
          cylinder,
          metric: "squish",
          numbers: { sideAMm: a, sideBMm: b, differenceMm: difference },
          message:
            `${head}: squish ${formatMm(a)} on side A and ${formatMm(b)} on side B differ by ${formatMm(difference)} ` +
            `(watch above ${formatLimitMm(t.squishSides.watchMm)}, act above ${formatLimitMm(t.squishSides.actMm)}): ` +
            "piston rock, head seating or a reading error.",
        }),
      );
    }
  }

  const attempt = latestFor(sets, cylinder, (c) => (c.chamberUnconfirmed || c.chamberCc != null ? c : null));
  if (attempt?.reading.chamberUnconfirmed) {
    const readings = attempt.reading.chamberReadingsCc ?? [];
    const numbers: Record<string, number> = {};
    readings.forEach((v, i) => (numbers[`reading${i + 1}Cc`] = v));
    if (readings.length >= 2) numbers.disagreementCc = Math.max(...readings) - Math.min(...readings);
    const listed = readings.length > 0 ? ` (${readings.map((v) => v.toFixed(1)).join(", ")} cc)` : "";
    signals.push(
      buildSignal({
        kind: "unconfirmed",
        severity: "watch",
        engineId,
        cylinder,
        metric: "chamber",
        numbers,
        message:
          `${head}: the repeated chamber readings${listed} never agreed, so the volume is unconfirmed ` +
          "and is left out of the drift and spread checks. Measure again.",
      }),
    );
  }

  if (classLimits) {
    const mean = latestFor(sets, cylinder, meanSquish);
    if (mean && classLimits.minSquishMm !== undefined && mean.value < classLimits.minSquishMm - 1e-9) {
      signals.push(
        buildSignal({
          kind: "class-rule",
          severity: "act",
          engineId,
          cylinder,
          metric: "squish",
          numbers: { squishMm: mean.value, minSquishMm: classLimits.minSquishMm },
          message:
            `${head}: mean squish ${formatMm(mean.value)} is below the ${classLimits.className} minimum ` +
            `of ${formatMm(classLimits.minSquishMm)}.`,
        }),
      );
    }
    const chamber = latestFor(sets, cylinder, confirmedChamber);
    if (chamber && classLimits.minChamberCc !== undefined && chamber.value < classLimits.minChamberCc - 1e-9) {
      signals.push(
        buildSignal({
          kind: "class-rule",
          severity: "act",
          engineId,
          cylinder,
          metric: "chamber",
          numbers: { chamberCc: chamber.value, minChamberCc: classLimits.minChamberCc },
          message:
            `${head}: installed chamber volume ${formatCc(chamber.value, 2)} is below the ${classLimits.className} ` +
            `minimum of ${formatCc(classLimits.minChamberCc, 2)}.`,
        }),
      );
    }
  }
  return signals;
}

/** Spread, side-to-side, unconfirmed and class-rule signals over the sets, oldest first. */
export function evaluateCylinderRules(
  engineId: string,
  engineName: string,
  cylinderCount: number,
  sets: ReadingSet[],
  t: SignalThresholds,
  classLimits: ClassLimits | null | undefined,
): Signal[] {
  const signals = evaluateSpread(engineId, engineName, sets, t);
  for (let cylinder = 1; cylinder <= cylinderCount; cylinder++) {
    signals.push(...evaluateCylinder(engineId, engineName, cylinder, sets, t, classLimits));
  }
  return signals;
}
