import { describe, expect, it } from "vitest";
import { buildChartBlocks } from "../../../src/components/motors/chart-series.ts";
import { DEFAULT_THRESHOLDS } from "../../../src/lib/domain/signal-rules/thresholds.ts";
import { IMPERIAL_UNITS, METRIC_UNITS } from "../../../src/lib/domain/units.ts";
import { computeSetFigures, type FigureEngine } from "../../../src/lib/motors/reading-figures.ts";
import type { CylinderReading, ReadingSet } from "../../../src/lib/motors/types.ts";

// DEMO.md's race twin: 72 × 73.8 mm, rod 130 mm, exhaust opening 82° ATDC.
const twin: FigureEngine = { cycle: "two_stroke", cylinders: 2, boreMm: 72, strokeMm: 73.8, rodMm: 130, exhaustOpensDegAtdc: 82 };
const thresholds = JSON.parse(JSON.stringify(DEFAULT_THRESHOLDS));

function cylinder(no: number, cc: number | null, squish: number | null, crankingKpa: number | null = null): CylinderReading {
  return { cylinderNo: no, chamberReadingsCc: cc === null ? [] : [cc, cc], flatPlateCc: null, squishAMm: squish, squishBMm: squish, crankingKpa, leakdownPct: null, notes: null };
}

let nextId = 1;
function set(takenOn: string, isBaseline: boolean, cylinders: CylinderReading[], opts: { archived?: boolean; elevationM?: number; referenceM?: number | null } = {}): ReadingSet {
  const figures = computeSetFigures(twin, cylinders, { toleranceCc: 0.2, elevationM: opts.elevationM ?? 366, referenceElevationM: opts.referenceM === undefined ? 366 : opts.referenceM, rules: null });
  return {
    id: nextId++, engineId: 1, engineName: "A-2", takenOn, takenBy: null, elevationM: opts.elevationM ?? 366, airTempC: null, methodNotes: null,
    isBaseline, setKind: isBaseline ? "build" : "between_events", archivedAt: opts.archived ? "2026-01-01T00:00:00.000Z" : null, createdAt: "",
    usageAtReading: { sinceNew: 0, sinceTopEnd: 0, sinceBottomEnd: 0 }, cylinders, figures, uploads: [],
  };
}

describe("buildChartBlocks", () => {
  // DEMO.md "Three engines that drift", A-2: baseline 23.6 cc and 1.20 mm, then 23.2 cc (−1.7 %:
  // watch) and 23.0 cc (−2.5 %: act). The watch level is a 1.5 % drop (TRADE.md, common practice).
  const sets = [
    set("2025-12-23", false, [cylinder(1, 23.2, 1.17), cylinder(2, 23.5, 1.2)]),
    set("2025-11-12", true, [cylinder(1, 23.6, 1.2), cylinder(2, 23.6, 1.21)]),
    set("2026-01-05", false, [cylinder(1, 23.5, 1.19), cylinder(2, 23.6, 1.2)], { archived: true }),
    set("2026-01-06", false, [cylinder(1, 23.0, 1.13), cylinder(2, 23.5, 1.2)]),
    set("2026-01-09", true, [cylinder(1, 23.6, 1.21), cylinder(2, 23.6, 1.21)]),
  ];

  it("draws each reading against the baseline in force when it was taken, in date order, without archived sets", () => {
    const [chamber] = buildChartBlocks(sets, 2, thresholds, METRIC_UNITS);
    expect(chamber.metric).toBe("chamber");
    expect(chamber.unitLabel).toBe("cc");
    const c1 = chamber.cylinders[0].points;
    expect(c1.map((p) => p.on)).toEqual(["2025-11-12", "2025-12-23", "2026-01-06", "2026-01-09"]);
    expect(c1.map((p) => p.baseline)).toEqual([23.6, 23.6, 23.6, 23.6]);
    expect(c1.map((p) => p.isBaseline)).toEqual([true, false, false, true]);
    // 23.6 × (1 ∓ 0.015) = 23.246 … 23.954 cc
    expect(c1[0].band?.[0]).toBeCloseTo(23.246, 2);
    expect(c1[0].band?.[1]).toBeCloseTo(23.954, 2);
    expect(c1.map((p) => p.outside)).toEqual([false, true, true, false]);
    // The other cylinder stayed within 0.1 cc: never outside.
    expect(chamber.cylinders[1].points.every((p) => !p.outside)).toBe(true);
  });

  it("puts squish in a band of the watch level in millimetres either side", () => {
    const squish = buildChartBlocks(sets, 2, thresholds, METRIC_UNITS).find((b) => b.metric === "squish")!;
    const c1 = squish.cylinders[0].points;
    expect(c1[0].band).toEqual([1.15, 1.25]);
    // 1.13 mm is 0.07 mm below a 1.20 mm baseline: past the 0.05 mm watch level.
    expect(c1.map((p) => p.outside)).toEqual([false, false, true, false]);
    expect(c1[3].baseline).toBe(1.21);
  });

  it("shows values and bands in the reader's units", () => {
    const [chamber] = buildChartBlocks(sets, 2, thresholds, IMPERIAL_UNITS);
    expect(chamber.unitLabel).toBe("in³");
    // 1 in = 25.4 mm exactly (international yard and pound, 1959): 23.6 cc / 16.387064 = 1.440159 in³
    // plotted one decimal finer than the 3 shown
    expect(chamber.cylinders[0].points[0].value).toBe(1.4402);
  });

  it("compares cranking at the shop's elevation when it is set, and as read when it is not", () => {
    const high = [set("2026-02-01", true, [cylinder(1, null, null, 800), cylinder(2, null, null, 790)], { elevationM: 2400 })];
    const corrected = buildChartBlocks(high, 2, thresholds, METRIC_UNITS).find((b) => b.metric === "cranking")!;
    // The same engine reads higher in the thinner air's absence: corrected to 366 m it is above 800 kPa.
    expect(corrected.cylinders[0].points[0].value).toBeGreaterThan(800);
    const raw = buildChartBlocks([set("2026-02-01", true, [cylinder(1, null, null, 800)], { elevationM: 2400, referenceM: null })], 2, thresholds, METRIC_UNITS).find((b) => b.metric === "cranking")!;
    expect(raw.cylinders[0].points[0].value).toBe(800);
  });

  it("leaves out quantities nobody measured, and has no band before the first baseline", () => {
    const blocks = buildChartBlocks([set("2025-11-01", false, [cylinder(1, 23.6, null), cylinder(2, 23.6, null)])], 2, thresholds, METRIC_UNITS);
    expect(blocks.map((b) => b.metric)).toEqual(["chamber"]);
    expect(blocks[0].cylinders[0].points[0]).toMatchObject({ baseline: null, band: null, outside: false });
  });
});
