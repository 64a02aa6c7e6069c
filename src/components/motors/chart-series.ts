import type { SignalThresholds } from "../../lib/domain/signal-rules/types.ts";
import { convertFromSi, getDisplayDecimals, getUnitLabel, type QuantityKind, type UnitChoice } from "../../lib/domain/units.ts";
import type { ReadingSet } from "../../lib/motors/types.ts";

// The engine file's drift charts as plain data: per quantity and cylinder, each reading over
// time with the baseline in force when it was taken and the watch band around that baseline
// (the thresholds the signal check applies to this engine). Worked out on the server, drawn by
// the chart island, so the island carries no arithmetic.

export type ChartMetric = "chamber" | "squish" | "cranking";

export interface ChartPoint {
  /** Days since 1970-01-01 (UTC), for a time-true horizontal axis. */
  day: number;
  on: string;
  value: number | null;
  baseline: number | null;
  /** [low, high] of the watch band around the baseline. */
  band: [number, number] | null;
  isBaseline: boolean;
  outside: boolean;
}

export interface CylinderSeries {
  cylinderNo: number;
  points: ChartPoint[];
}

export interface ChartBlock {
  metric: ChartMetric;
  title: string;
  unitLabel: string;
  decimals: number;
  bandNote: string;
  cylinders: CylinderSeries[];
}

const KIND: Record<ChartMetric, QuantityKind> = { chamber: "volume", squish: "squish", cranking: "pressure" };

function dayNumber(on: string): number {
  return Math.round(Date.parse(`${on}T00:00:00Z`) / 86_400_000);
}

/** The value of one cylinder in one set, in SI (cc, mm, kPa); null when not measured or not accepted. */
function pickValue(set: ReadingSet, cylinderNo: number, metric: ChartMetric): number | null {
  const f = set.figures.cylinders.find((c) => c.cylinderNo === cylinderNo);
  if (!f) return null;
  if (metric === "chamber") return f.chamber.valueCc;
  if (metric === "squish") return f.squishMeanMm;
  // Cranking read at different elevations only compares once corrected to the shop's.
  const raw = set.cylinders.find((c) => c.cylinderNo === cylinderNo)?.crankingKpa ?? null;
  return f.crankingAtReferenceKpa ?? raw;
}

/** The watch band around a baseline, in SI. */
function bandAround(metric: ChartMetric, baseline: number, t: SignalThresholds): [number, number] {
  if (metric === "chamber") return [baseline * (1 - t.chamber.watchDropPct / 100), baseline * (1 + t.chamber.watchDropPct / 100)];
  if (metric === "squish") return [baseline - t.squish.watchMm, baseline + t.squish.watchMm];
  return [baseline * (1 - t.cranking.watchDropPct / 100), baseline * (1 + t.cranking.watchRisePct / 100)];
}

function describeBand(metric: ChartMetric, t: SignalThresholds, units: UnitChoice): string {
  if (metric === "chamber") return `Band: within ${t.chamber.watchDropPct} % of the baseline (watch level).`;
  if (metric === "squish") {
    const mm = convertFromSi("squish", t.squish.watchMm, units);
    return `Band: baseline ± ${mm.toFixed(getDisplayDecimals("squish", units))} ${getUnitLabel("squish", units)} (watch level).`;
  }
  return `Band: ${t.cranking.watchDropPct} % below to ${t.cranking.watchRisePct} % above the baseline (watch level); readings corrected to the shop's elevation where it is set.`;
}

const TITLE: Record<ChartMetric, string> = {
  chamber: "Installed chamber volume",
  squish: "Squish (mean of both sides)",
  cranking: "Cranking compression",
};

const round = (v: number, decimals: number): number => Math.round(v * 10 ** (decimals + 1)) / 10 ** (decimals + 1);

/** Chart blocks for every quantity that has at least one reading. `sets` may come in any order. */
export function buildChartBlocks(sets: ReadingSet[], cylinders: number, thresholds: SignalThresholds, units: UnitChoice): ChartBlock[] {
  const ordered = [...sets].filter((s) => s.archivedAt === null).sort((a, b) => (a.takenOn === b.takenOn ? a.id - b.id : a.takenOn < b.takenOn ? -1 : 1));
  const blocks: ChartBlock[] = [];
  for (const metric of ["chamber", "squish", "cranking"] as const) {
    const kind = KIND[metric];
    const decimals = getDisplayDecimals(kind, units);
    const show = (si: number): number => round(convertFromSi(kind, si, units), decimals);
    const series: CylinderSeries[] = [];
    for (let cyl = 1; cyl <= cylinders; cyl += 1) {
      let baseline: number | null = null;
      const points: ChartPoint[] = [];
      for (const set of ordered) {
        const value = pickValue(set, cyl, metric);
        // A new baseline set replaces the reference from its own date on, even for a quantity it did not measure.
        if (set.isBaseline) baseline = value;
        if (value === null) continue;
        const band = baseline === null ? null : bandAround(metric, baseline, thresholds);
        points.push({
          day: dayNumber(set.takenOn),
          on: set.takenOn,
          value: show(value),
          baseline: baseline === null ? null : show(baseline),
          band: band ? [show(band[0]), show(band[1])] : null,
          isBaseline: set.isBaseline,
          outside: band !== null && (value < band[0] - 1e-9 || value > band[1] + 1e-9),
        });
      }
      if (points.length) series.push({ cylinderNo: cyl, points });
    }
    if (series.length) {
      blocks.push({ metric, title: TITLE[metric], unitLabel: getUnitLabel(kind, units), decimals, bandNote: describeBand(metric, thresholds, units), cylinders: series });
    }
  }
  return blocks;
}
