import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { standardAtmosphere } from "../../../src/lib/domain/atmosphere";
import {
  computeAtmosphere,
  computeCompression,
  computeFuelCheck,
  DEFAULT_FUEL_TABLE,
  findCompressionInputErrors,
  findFuelCheckInputErrors,
} from "../../../src/lib/domain/calc-api";
import type { CompressionInput, FuelCheckInput } from "../../../src/lib/domain/calc-api";
import { CAUTION_DEFAULT_FUEL_TABLE, FUEL_CAUTIONS } from "../../../src/lib/domain/cautions";
import { computeCcPerMm } from "../../../src/lib/domain/compression";
import { estimateCrankingKpa } from "../../../src/lib/domain/cranking";
import { expectAllFinite, expectFieldError, expectPrinted, expectRelative } from "./expect-helpers";

// DEMO.md engines (worked-through consistency checks): A-1 race twin and A-5 altitude twin.
const a1: CompressionInput = { boreMm: 72, strokeMm: 73.8, rodMm: 130, exhaustOpensDegAtdc: 82, chamberCc: 23.6, flatPlateCc: 26.4, cylinders: 2 };
const a5: FuelCheckInput = {
  boreMm: 85,
  strokeMm: 70,
  rodMm: 140,
  exhaustOpensDegAtdc: 80,
  chamberCc: 27.5,
  flatPlateCc: 31,
  cylinders: 2,
  elevationM: 396,
  builtForMinElevationM: 1800,
};

describe("computeCompression", () => {
  it("answers only the always-present fields for the three required inputs", () => {
    const result = computeCompression({ boreMm: 72, strokeMm: 73.8, chamberCc: 23.6 });
    expect(Object.keys(result).sort()).toEqual(["displacementCc", "geometricRatio", "sweptCc"]);
    expect(result.displacementCc).toBe(result.sweptCc);
  });

  it("answers every field of API.md for the demo engine", () => {
    // DEMO.md A-1: 300.5 cc per cylinder, geometric 13.73, trapped 7.38, offset −2.8 cc
    const result = computeCompression({ ...a1, targetRatio: 13 });
    expectPrinted(result.sweptCc, 300.5, 1);
    expectPrinted(result.displacementCc, 601.0, 1);
    expectPrinted(result.geometricRatio, 13.73, 2);
    expectPrinted(result.trappedRatio ?? 0, 7.38, 2);
    expect(result.chamberOffsetCc).toBeCloseTo(-2.8, 12);
    expect(result.exhaustOpensDegAtdc).toBe(82);
    expect(result.exhaustDurationDeg).toBe(196);
    // Vc = Vs/(rc − 1) for 13:1
    expectRelative(result.targetChamberCc ?? 0, result.sweptCc / 12, 1e-12);
    expect(result.targetFlatPlateCc).toBeCloseTo((result.targetChamberCc ?? 0) + 2.8, 12);
    expect(result.headCutMm).toBeLessThan(0);
    expect((result.headCutMm ?? 0) * computeCcPerMm(72)).toBeCloseTo(23.6 - (result.targetChamberCc ?? 0), 12);
    expectRelative(result.trappedSweptCc ?? 0, (result.trappedRatio ?? 0) * 23.6 - 23.6, 1e-12);
  });

  it("takes the port position as a travel, adding the angle when the rod is known", () => {
    const fromAngle = computeCompression(a1);
    const { exhaustOpensDegAtdc: _a, rodMm: _r, ...rest } = a1;
    void _a;
    void _r;
    const noRod = computeCompression({ ...rest, exhaustTravelMm: fromAngle.exhaustTravelMm });
    expect(noRod.trappedRatio).toBeCloseTo(fromAngle.trappedRatio ?? 0, 12);
    expect(noRod.exhaustOpensDegAtdc).toBeUndefined();
    const withRod = computeCompression({ ...rest, rodMm: 130, exhaustTravelMm: fromAngle.exhaustTravelMm });
    expect(withRod.exhaustOpensDegAtdc).toBeCloseTo(82, 9);
    expect(withRod.exhaustDurationDeg).toBeCloseTo(196, 9);
  });

  it("leaves out what its inputs do not give", () => {
    const result = computeCompression({ boreMm: 72, strokeMm: 73.8, chamberCc: 23.6, targetRatio: 14 });
    expect(result.targetChamberCc).toBeDefined();
    expect(result.targetFlatPlateCc).toBeUndefined();
    expect(result.chamberOffsetCc).toBeUndefined();
    expect(result.trappedRatio).toBeUndefined();
  });

  it("names every bad field at once", () => {
    expect(Object.keys(findCompressionInputErrors({})).sort()).toEqual(["boreMm", "chamberCc", "strokeMm"]);
    const errors = findCompressionInputErrors({
      boreMm: "72",
      strokeMm: 73.8,
      chamberCc: 0,
      cylinders: 0,
      rodMm: 30,
      exhaustOpensDegAtdc: 181,
      exhaustTravelMm: 80,
      flatPlateCc: -1,
      targetRatio: 0.9,
    });
    expect(Object.keys(errors).sort()).toEqual(
      ["boreMm", "chamberCc", "cylinders", "exhaustOpensDegAtdc", "exhaustTravelMm", "flatPlateCc", "rodMm", "targetRatio"].sort(),
    );
    expect(findCompressionInputErrors({ ...a1, rodMm: undefined }).rodMm).toMatch(/rodMm/);
    expect(findCompressionInputErrors({ ...a1, boreMm: Number.NaN }).boreMm).toBeDefined();
    expect(findCompressionInputErrors({ ...a1, boreMm: -72 }).boreMm).toBeDefined();
    expect(findCompressionInputErrors({ ...a1, strokeMm: Infinity }).strokeMm).toBeDefined();
    expect(findCompressionInputErrors({ ...a1 })).toEqual({});
  });

  it("throws a DomainInputError naming the field", () => {
    expectFieldError(() => computeCompression({ ...a1, chamberCc: 0 }), "chamberCc");
    expectFieldError(() => computeCompression({ ...a1, rodMm: 36.9 }), "rodMm");
    expectFieldError(() => computeCompression({ ...a1, exhaustOpensDegAtdc: -5 }), "exhaustOpensDegAtdc");
    expectFieldError(() => computeCompression({ boreMm: 72, strokeMm: 73.8, chamberCc: 40, flatPlateCc: 5, targetRatio: 30 }), "targetRatio");
  });

  it("never answers NaN or Infinity for valid input (property)", () => {
    fc.assert(
      fc.property(
        fc.record({
          boreMm: fc.double({ min: 20, max: 150, noNaN: true }),
          strokeMm: fc.double({ min: 20, max: 150, noNaN: true }),
          chamberCc: fc.double({ min: 1, max: 150, noNaN: true }),
          rodShare: fc.double({ min: 0.51, max: 4, noNaN: true }),
          exhaustOpensDegAtdc: fc.double({ min: 0, max: 180, noNaN: true }),
          targetRatio: fc.double({ min: 1.5, max: 25, noNaN: true }),
          cylinders: fc.integer({ min: 1, max: 8 }),
        }),
        ({ rodShare, ...input }) => {
          const result = computeCompression({ ...input, rodMm: input.strokeMm * rodShare });
          expectAllFinite(result);
          expect(JSON.parse(JSON.stringify(result))).toEqual(result);
        },
      ),
    );
  });
});

describe("computeFuelCheck", () => {
  it("flags the altitude engine entered at a low event, with the default table's caution", () => {
    // DEMO.md A-5 (altitude inserts, not below 1,800 m) at Birchmoor, 396 m
    const result = computeFuelCheck(a5);
    expect(result.riskFlags.map((f) => f.code)).toContain("built-for-altitude-at-low-event");
    expectRelative(result.ambientKpa, standardAtmosphere(396).pressureKpa, 1e-12);
    expect(result.densityAltitudeM).toBeCloseTo(396, 6);
    expect(result.airTempC).toBeCloseTo(standardAtmosphere(396).temperatureC, 12);
    expectRelative(result.crankingKpaEstimate, estimateCrankingKpa(result.ambientKpa, result.trappedRatio ?? 0).gaugeKpa, 1e-12);
    const row = DEFAULT_FUEL_TABLE.rows.find((r) => r.grade === result.fuelGrade);
    expect(row).toBeDefined();
    expect(result.margin).toBeCloseTo((row?.upToCrankingKpa ?? 0) - result.crankingKpaEstimate, 9);
    expect(result.cautions).toEqual([...FUEL_CAUTIONS, CAUTION_DEFAULT_FUEL_TABLE]);
    expect(result.fuelTableLabel).toBe(DEFAULT_FUEL_TABLE.label);
    expect(result.ratioBasis).toBe("trapped");
    expectAllFinite(result);
  });

  it("reads cold air as lower altitude: higher estimate, and the flag returns", () => {
    // DEMO.md A-5 at Copperjack Basin, 2,103 m
    const standardDay = computeFuelCheck({ ...a5, elevationM: 2103 });
    expect(standardDay.riskFlags.map((f) => f.code)).not.toContain("built-for-altitude-at-low-event");
    const coldDay = computeFuelCheck({ ...a5, elevationM: 2103, airTempC: -20 });
    expect(coldDay.densityAltitudeM).toBeLessThan(1800);
    expect(coldDay.crankingKpaEstimate).toBeGreaterThan(standardDay.crankingKpaEstimate);
    expect(coldDay.equivalentAmbientKpa).toBeGreaterThan(coldDay.ambientKpa);
    expect(coldDay.riskFlags.map((f) => f.code)).toContain("built-for-altitude-at-low-event");
  });

  it("scales the published dynamic-compression example at sea level", () => {
    // Wikipedia, "Compression ratio": rc 7.5, n 1.3 → 187.1 psig over 14.7 psi ambient;
    // a trapped ratio of exactly 7.5 (trapped swept = 6.5 × 20 cc) on a standard sea-level day
    const result = computeFuelCheck({ boreMm: 72, strokeMm: 73.8, chamberCc: 20, exhaustTravelMm: 130 / computeCcPerMm(72), elevationM: 0 });
    expect(result.trappedRatio).toBeCloseTo(7.5, 12);
    expect(Math.abs(result.crankingKpaEstimate / result.ambientKpa - 187.1 / 14.7)).toBeLessThan(0.05 / 14.7);
  });

  it("uses the team's own table, exponent and fuel", () => {
    const result = computeFuelCheck({
      ...a5,
      elevationM: 2103,
      polytropicExponent: 1.1,
      fuelTable: [{ upToCrankingKpa: 2000, grade: "Our blend B", octaneAki: 98 }],
      buildMinOctaneAki: 100,
    });
    expect(result.polytropicExponent).toBe(1.1);
    expect(result.fuelGrade).toBe("Our blend B");
    expect(result.margin).toBeCloseTo(2000 - result.crankingKpaEstimate, 9);
    expect(result.cautions).not.toContain(CAUTION_DEFAULT_FUEL_TABLE);
    expect(result.riskFlags.map((f) => f.code)).toEqual(["fuel-below-build-minimum"]);
  });

  it("answers a null grade and a negative margin above the table", () => {
    const result = computeFuelCheck({ ...a5, elevationM: 2103, fuelTable: { label: "tiny", rows: [{ upToCrankingKpa: 500, grade: "x" }] } });
    expect(result.fuelGrade).toBeNull();
    expect(result.margin).toBeLessThan(0);
    expect(result.riskFlags.map((f) => f.code)).toContain("above-fuel-table");
    expect(result.fuelTableLabel).toBe("tiny");
  });

  it("falls back to the geometric ratio without exhaust timing, and says so", () => {
    const result = computeFuelCheck({ boreMm: 92, strokeMm: 85, chamberCc: 60.8, elevationM: 2408 });
    expect(result.ratioBasis).toBe("geometric");
    expect(result.riskFlags.map((f) => f.code)).toContain("estimate-from-geometric-ratio");
  });

  it("names every bad field", () => {
    const errors = findFuelCheckInputErrors({ boreMm: 72, strokeMm: 73.8, chamberCc: 23.6, elevationM: 9500, airTempC: 80, polytropicExponent: 5, fuelTable: [], fuelOctaneAki: -1, builtForMinElevationM: "high" });
    expect(Object.keys(errors).sort()).toEqual(["airTempC", "builtForMinElevationM", "elevationM", "fuelOctaneAki", "fuelTable", "polytropicExponent"]);
    expect(Object.keys(findFuelCheckInputErrors({ chamberCc: 0 })).sort()).toEqual(["boreMm", "chamberCc", "elevationM", "strokeMm"]);
    expect(findFuelCheckInputErrors({ ...a5, fuelTable: "premium" }).fuelTable).toBeDefined();
    expectFieldError(() => computeFuelCheck({ ...a5, elevationM: -501 }), "elevationM");
    expectFieldError(() => computeFuelCheck({ ...a5, elevationM: Number.NaN }), "elevationM");
  });
});

describe("computeAtmosphere", () => {
  it("answers the standard atmosphere fields", () => {
    const result = computeAtmosphere({ elevationM: 1000 });
    expect(result).toEqual(standardAtmosphere(1000));
    expect(Object.keys(result)).toEqual(expect.arrayContaining(["pressureKpa", "temperatureC", "densityKgM3", "pressureRatio"]));
  });

  it("names a missing or bad elevation", () => {
    expectFieldError(() => computeAtmosphere({ elevationM: undefined }), "elevationM");
    expectFieldError(() => computeAtmosphere({ elevationM: "1000" }), "elevationM");
    expectFieldError(() => computeAtmosphere({ elevationM: 12000 }), "elevationM");
  });
});
