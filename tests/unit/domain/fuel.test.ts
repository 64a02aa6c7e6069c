import { describe, it, expect } from "vitest";
import {
  DEFAULT_FUEL_TABLE,
  findFuelRisks,
  GAUGE_SCATTER_SHARE,
  normalizeFuelTable,
  selectFuelRow,
} from "../../../src/lib/domain/fuel";
import type { FuelRiskInput } from "../../../src/lib/domain/fuel";
import { psiToKpa } from "../../../src/lib/domain/units";
import { expectFieldError, expectPrinted } from "./expect-helpers";

describe("the default fuel table", () => {
  it("says it is a common-practice default the team must review", () => {
    expect(DEFAULT_FUEL_TABLE.label).toMatch(/common-practice/i);
    expect(DEFAULT_FUEL_TABLE.label).toMatch(/review/i);
    expect(DEFAULT_FUEL_TABLE.label).toMatch(/not a specification/i);
  });

  it("has rising bounds at the quoted psi bands, converted exactly", () => {
    // Bands after Jennings, Two-Stroke Tuner's Handbook (1973), as quoted (REFERENCES.md), at
    // 125/150/175/200 psi; rounded to whole kPa with psi = 6.894757293168 kPa (exact factor)
    const psi = [125, 150, 175, 200];
    DEFAULT_FUEL_TABLE.rows.forEach((row, i) => {
      expectPrinted(row.upToCrankingKpa, psiToKpa(psi[i]), 0);
      expect(row.grade.length).toBeGreaterThan(0);
      if (i > 0) expect(row.upToCrankingKpa).toBeGreaterThan(DEFAULT_FUEL_TABLE.rows[i - 1].upToCrankingKpa);
    });
  });

  it("cannot be changed by accident", () => {
    expect(Object.isFrozen(DEFAULT_FUEL_TABLE)).toBe(true);
    expect(Object.isFrozen(DEFAULT_FUEL_TABLE.rows)).toBe(true);
    expect(Object.isFrozen(DEFAULT_FUEL_TABLE.rows[0])).toBe(true);
  });
});

describe("selectFuelRow", () => {
  const table = [
    { upToCrankingKpa: 1000, grade: "team pump mix" },
    { upToCrankingKpa: 800, grade: "team low" },
  ];

  it("takes the first row whose bound the estimate does not pass, in rising order", () => {
    expect(selectFuelRow(table, 700)).toEqual({ row: table[1], marginKpa: 100 });
    expect(selectFuelRow(table, 800)).toEqual({ row: table[1], marginKpa: 0 });
    expect(selectFuelRow(table, 900).row?.grade).toBe("team pump mix");
  });

  it("gives no row and a negative margin above the table", () => {
    expect(selectFuelRow(table, 1100)).toEqual({ row: null, marginKpa: -100 });
  });

  it("refuses broken tables", () => {
    expectFieldError(() => normalizeFuelTable([]), "fuelTable");
    expectFieldError(() => normalizeFuelTable([{ upToCrankingKpa: 0, grade: "x" }]), "fuelTable[0].upToCrankingKpa");
    expectFieldError(() => normalizeFuelTable([{ upToCrankingKpa: 900, grade: " " }]), "fuelTable[0].grade");
    expectFieldError(() => selectFuelRow(table, Number.NaN), "crankingKpaEstimate");
  });

  it("keeps the team's label, or names an unlabelled table as theirs", () => {
    expect(normalizeFuelTable({ label: "Builder sheet, 2025", rows: table }).label).toBe("Builder sheet, 2025");
    expect(normalizeFuelTable(table).label).toMatch(/team/i);
  });
});

describe("findFuelRisks", () => {
  const base: FuelRiskInput = {
    elevationM: 2103,
    densityAltitudeM: 2103,
    crankingKpaGauge: 900,
    choice: { row: { upToCrankingKpa: 1034, grade: "93", octaneAki: 93 }, marginKpa: 134 },
    ratioBasis: "trapped",
  };
  const codes = (input: FuelRiskInput): string[] => findFuelRisks(input).map((f) => f.code);

  it("is quiet when nothing is wrong", () => {
    expect(codes(base)).toEqual([]);
    expect(codes({ ...base, builtForMinElevationM: 1800, buildMinOctaneAki: 91 })).toEqual([]);
  });

  it("flags an engine built for altitude entered low, by elevation or by density altitude", () => {
    // PRODUCT.md / TRADE.md: an engine built for altitude at a low event is the dangerous case
    expect(codes({ ...base, builtForMinElevationM: 1800, elevationM: 396, densityAltitudeM: 396 })).toEqual(["built-for-altitude-at-low-event"]);
    expect(codes({ ...base, builtForMinElevationM: 1800, densityAltitudeM: 1290 })).toEqual(["built-for-altitude-at-low-event"]);
  });

  it("flags a fuel below the build sheet's minimum", () => {
    expect(codes({ ...base, buildMinOctaneAki: 100 })).toEqual(["fuel-below-build-minimum"]);
    expect(codes({ ...base, buildMinOctaneAki: 100, fuelOctaneAki: 100 })).toEqual([]);
    expect(codes({ ...base, buildMinOctaneAki: 100, fuelOctaneAki: 98 })).toEqual(["fuel-below-build-minimum"]);
  });

  it("flags an estimate above the table and one inside the gauge's scatter", () => {
    expect(codes({ ...base, choice: { row: null, marginKpa: -50 } })).toEqual(["above-fuel-table"]);
    const near = GAUGE_SCATTER_SHARE * 900 - 1;
    expect(codes({ ...base, choice: { ...base.choice, marginKpa: near } })).toEqual(["margin-within-gauge-scatter"]);
  });

  it("says when the estimate rests on the geometric ratio", () => {
    expect(codes({ ...base, ratioBasis: "geometric" })).toEqual(["estimate-from-geometric-ratio"]);
    expect(findFuelRisks({ ...base, ratioBasis: "geometric" })[0].message.length).toBeGreaterThan(20);
  });
});
