import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  computeAirDensityKgM3,
  computeDensityAltitude,
  densityAltitudeM,
  geometricFromGeopotentialM,
  geopotentialFromGeometricM,
  PRESSURE_EXPONENT,
  standardAtmosphere,
  standardAtmosphereAtGeopotential,
} from "../../../src/lib/domain/atmosphere";
import { feetToMetres } from "../../../src/lib/domain/units";
import { expectAllFinite, expectFieldError, expectPrinted, expectRelative } from "./expect-helpers";

describe("standard atmosphere", () => {
  it("has the 1976 sea-level values", () => {
    // U.S. Standard Atmosphere 1976: 101325 Pa, 288.15 K, 1.2250 kg/m³ (table, 5 digits)
    const sea = standardAtmosphere(0);
    expect(sea.pressureKpa).toBe(101.325);
    expect(sea.temperatureC).toBeCloseTo(15, 12);
    expectPrinted(sea.densityKgM3, 1.225, 4);
    expect(sea.pressureRatio).toBe(1);
  });

  it("uses the published pressure exponent", () => {
    // REFERENCES.md: p = 101325·(T/288.15)^5.255876
    expectPrinted(PRESSURE_EXPONENT, 5.255876, 6);
  });

  it("matches the printed geopotential table", () => {
    // U.S. Standard Atmosphere 1976 as given in REFERENCES.md: 1000 m 89874.6 Pa, 2000 m 79495.2 Pa, 3000 m 70108.5 Pa
    const table: Array<[number, number]> = [
      [1000, 89874.6],
      [2000, 79495.2],
      [3000, 70108.5],
    ];
    for (const [h, pa] of table) {
      expectPrinted(standardAtmosphereAtGeopotential(h).pressureKpa * 1000, pa, 1);
      // the same heights reached from their geometric elevations
      expectPrinted(standardAtmosphere(geometricFromGeopotentialM(h)).pressureKpa * 1000, pa, 1);
    }
    // T = 288.15 − 0.0065·H: 281.65 K at 1000 m geopotential (definition of the layer)
    expect(standardAtmosphereAtGeopotential(1000).temperatureC).toBeCloseTo(8.5, 12);
  });

  it("matches the geometric-height table (from memory)", () => {
    // U.S. Standard Atmosphere 1976, geometric-altitude table, from memory: pressure
    // 8.9876E+4, 7.9501E+4, 7.0121E+4 Pa and density 1.1117, 1.0066, 0.90925 kg/m³
    expectPrinted(standardAtmosphere(1000).pressureKpa * 1000, 89876, 0);
    expectPrinted(standardAtmosphere(2000).pressureKpa * 1000, 79501, 0);
    expectPrinted(standardAtmosphere(3000).pressureKpa * 1000, 70121, 0);
    expectPrinted(standardAtmosphere(1000).densityKgM3, 1.1117, 4);
    expectPrinted(standardAtmosphere(2000).densityKgM3, 1.0066, 4);
    expectPrinted(standardAtmosphere(3000).densityKgM3, 0.90925, 5);
  });

  it("converts geometric to geopotential height", () => {
    // REFERENCES.md: H = 6356766·Z/(6356766 + Z)
    expectRelative(geopotentialFromGeometricM(1000), (6356766 * 1000) / 6357766, 1e-12);
    fc.assert(
      fc.property(fc.double({ min: -500, max: 9000, noNaN: true }), (z) => {
        expect(geometricFromGeopotentialM(geopotentialFromGeometricM(z))).toBeCloseTo(z, 8);
        // H − Z = −Z²/(r0 + Z) ≤ 0: geopotential height never exceeds geometric height
        expect(geopotentialFromGeometricM(z)).toBeLessThanOrEqual(z + 1e-12 * Math.abs(z));
      }),
    );
  });

  it("loses pressure at about the rule-of-thumb rate near sea level", () => {
    // TRADE.md (common practice): about 3.4 % per 1,000 ft; about 1 % per 250 ft
    const perThousandFeet = 1 - standardAtmosphere(feetToMetres(1000)).pressureRatio;
    expect(perThousandFeet).toBeGreaterThan(0.03);
    expect(perThousandFeet).toBeLessThan(0.04);
    const perQuarter = 1 - standardAtmosphere(feetToMetres(250)).pressureRatio;
    expect(perQuarter).toBeGreaterThan(0.008);
    expect(perQuarter).toBeLessThan(0.011);
  });

  it("is finite and falling over the whole valid range (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: -500, max: 8999, noNaN: true }), (z) => {
        const here = standardAtmosphere(z);
        expectAllFinite(here);
        expect(standardAtmosphere(z + 1).pressureKpa).toBeLessThan(here.pressureKpa);
      }),
    );
  });

  it("refuses elevations outside −500…9000 m", () => {
    expectFieldError(() => standardAtmosphere(-501), "elevationM");
    expectFieldError(() => standardAtmosphere(9001), "elevationM");
    expectFieldError(() => standardAtmosphere(Number.NaN), "elevationM");
    expect(() => standardAtmosphere(-500)).not.toThrow();
    expect(() => standardAtmosphere(9000)).not.toThrow();
  });
});

describe("density altitude", () => {
  it("equals the elevation on a standard day (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: -500, max: 9000, noNaN: true }), (z) => {
        expect(densityAltitudeM(z, standardAtmosphere(z).temperatureC)).toBeCloseTo(z, 6);
      }),
    );
  });

  it("makes cold air at 8,000 ft as dense as a standard 5,000 ft", () => {
    // TRADE.md (common practice): −25 °C at 8,000 ft is about a standard day at 5,000 ft
    const da = computeDensityAltitude(feetToMetres(8000), -25);
    expect(Math.abs(da.densityAltitudeM - feetToMetres(5000))).toBeLessThan(50);
    expectRelative(da.densityKgM3, standardAtmosphere(da.densityAltitudeM).densityKgM3, 1e-9);
    expectRelative(da.equivalentPressureKpa, standardAtmosphere(da.densityAltitudeM).pressureKpa, 1e-9);
  });

  it("rises with air temperature (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: -500, max: 9000, noNaN: true }), fc.double({ min: -90, max: 59, noNaN: true }), (z, t) => {
        expect(densityAltitudeM(z, t + 1)).toBeGreaterThan(densityAltitudeM(z, t));
      }),
    );
  });

  it("uses the ideal-gas density of dry air", () => {
    // ρ = p·M/(R*·T) with the 1976 constants (REFERENCES.md)
    expectRelative(computeAirDensityKgM3(101.325, 15), (101325 * 0.0289644) / (8.31432 * 288.15), 1e-12);
    expectFieldError(() => computeAirDensityKgM3(0, 15), "pressureKpa");
    expectFieldError(() => computeAirDensityKgM3(100, -300), "temperatureC");
  });

  it("refuses implausible air temperatures", () => {
    expectFieldError(() => densityAltitudeM(1000, 61), "airTempC");
    expectFieldError(() => densityAltitudeM(1000, Number.NaN), "airTempC");
    expectFieldError(() => densityAltitudeM(9500, 10), "elevationM");
  });
});
