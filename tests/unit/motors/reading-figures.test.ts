import { describe, expect, it } from "vitest";
import { DomainInputError } from "../../../src/lib/domain/errors.ts";
import { computeSetFigures, type FigureCylinder, type FigureEngine } from "../../../src/lib/motors/reading-figures.ts";

const single: FigureEngine = { cycle: "two_stroke", cylinders: 1, boreMm: 100, strokeMm: 100, rodMm: null, exhaustOpensDegAtdc: null };
const opts = { toleranceCc: 0.2, elevationM: 0, referenceElevationM: null, rules: null };

function cyl(no: number, c: Partial<FigureCylinder> = {}): FigureCylinder {
  return { cylinderNo: no, chamberReadingsCc: [], flatPlateCc: null, squishAMm: null, squishBMm: null, crankingKpa: null, leakdownPct: null, ...c };
}

describe("computeSetFigures", () => {
  it("works the ratio from the agreeing pair of burette readings", () => {
    const f = computeSetFigures(single, [cyl(1, { chamberReadingsCc: [50, 50.1, 50], flatPlateCc: 52.5 })], opts);
    // π/4 · (10 cm)² · 10 cm = 785.398 cc (arithmetic); rc = (Vs + Vc) / Vc (Heywood, Internal
    // Combustion Engine Fundamentals, eq. 2.6, from memory): (785.398 + 50) / 50 = 16.708
    expect(f.sweptCc).toBeCloseTo(785.398, 3);
    expect(f.cylinders[0].chamber).toMatchObject({ status: "confirmed", valueCc: 50, agreeingIndexes: [0, 2] });
    expect(f.cylinders[0].geometricRatio).toBeCloseTo(16.708, 3);
    expect(f.cylinders[0].chamberOffsetCc).toBeCloseTo(-2.5, 9);
    expect(f.cylinders[0].trappedRatio).toBeNull();
    expect(f.chamberSpread).toBeNull();
  });

  it("gives no ratio for readings that never agreed", () => {
    const f = computeSetFigures(single, [cyl(1, { chamberReadingsCc: [49, 50, 51] })], opts);
    expect(f.cylinders[0].chamber.status).toBe("unconfirmed");
    expect(f.cylinders[0].geometricRatio).toBeNull();
  });

  it("counts the mean of the two squish sides for a class minimum, and checks displacement", () => {
    const twin: FigureEngine = { ...single, cylinders: 2 };
    const rules = { id: 1, name: "Test class", minSquishMm: 1.1, minChamberCc: null, minFlatPlateCc: null, maxDisplacementCc: 1500, squishWireNote: null };
    const f = computeSetFigures(twin, [cyl(1, { squishAMm: 1.05, squishBMm: 1.2 }), cyl(2, { squishAMm: 1.0, squishBMm: 1.1 })], { ...opts, rules });
    expect(f.cylinders.map((c) => c.squishMeanMm)).toEqual([1.125, 1.05]);
    expect(f.cylinders[0].squishSideDifferenceMm).toBeCloseTo(0.15, 9);
    expect(f.compliance?.compliant).toBe(false);
    expect(f.compliance?.checks.map((c) => [c.rule, c.cylinderNo, c.pass])).toEqual([
      ["minSquishMm", 1, true],
      ["minSquishMm", 2, false],
      ["maxDisplacementCc", null, false],
    ]);
  });

  it("says nothing about compliance when no rule could be measured", () => {
    const rules = { id: 1, name: "Test class", minSquishMm: 1.1, minChamberCc: 20, minFlatPlateCc: null, maxDisplacementCc: null, squishWireNote: null };
    const f = computeSetFigures(single, [cyl(1, { crankingKpa: 900 })], { ...opts, rules });
    expect(f.compliance?.compliant).toBeNull();
    expect(f.compliance?.checks.every((c) => c.pass === null)).toBe(true);
  });

  it("shows cranking at the reference elevation, and a dead cylinder's spread", () => {
    const twin: FigureEngine = { ...single, cylinders: 2 };
    const f = computeSetFigures(twin, [cyl(1, { crankingKpa: 1000 }), cyl(2, { crankingKpa: 0 })], { ...opts, elevationM: 2000, referenceElevationM: 0 });
    // ICAO standard atmosphere (Doc 7488, from memory): 101.325 kPa at 0 m, 79.50 kPa at 2,000 m:
    // 1000 × 101.325 / 79.50 = 1274.5 kPa
    expect(f.cylinders[0].crankingAtReferenceKpa!).toBeCloseTo(1274.5, 0);
    expect(f.crankingSpread).toEqual({ min: 0, max: 1000, spread: 1000, spreadPercent: 100 });
  });

  it("gives a two-stroke a trapped ratio from port timing, and a four-stroke none", () => {
    const timed: FigureEngine = { cycle: "two_stroke", cylinders: 1, boreMm: 72, strokeMm: 73.8, rodMm: 130, exhaustOpensDegAtdc: 82 };
    const two = computeSetFigures(timed, [cyl(1, { chamberReadingsCc: [23.6, 23.6] })], opts);
    expect(two.cylinders[0].trappedRatio).toBeGreaterThan(1);
    expect(two.cylinders[0].trappedRatio!).toBeLessThan(two.cylinders[0].geometricRatio!);
    const four = computeSetFigures({ ...timed, cycle: "four_stroke" }, [cyl(1, { chamberReadingsCc: [23.6, 23.6] })], opts);
    expect(four.cylinders[0].trappedRatio).toBeNull();
  });

  it("refuses a spec the arithmetic cannot use, naming the field", () => {
    expect(() => computeSetFigures({ ...single, boreMm: 0 }, [cyl(1)], opts)).toThrow(DomainInputError);
    try {
      computeSetFigures({ ...single, boreMm: 0 }, [cyl(1)], opts);
    } catch (err) {
      expect((err as DomainInputError).field).toBe("boreMm");
    }
  });
});
