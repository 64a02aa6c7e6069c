import { DomainInputError } from "./errors";
import { requireFinite, requirePositive } from "./input-guards";

// The fuel table is the team's: rows of an upper bound of estimated cranking pressure (kPa,
// gauge) and the fuel the team runs under it. No published formula turns compression into an
// octane requirement, so Ringland only finds the row and flags the dangerous cases.

export interface FuelTableRow {
  /** Upper bound of the estimated cranking pressure for this row, kPa gauge. */
  upToCrankingKpa: number;
  /** The fuel as the team wrote it. */
  grade: string;
  /** Anti-knock index (R+M)/2 of that fuel, where the team records one. */
  octaneAki?: number;
}

export interface FuelTable {
  /** Where the rows come from, shown beside them. */
  label: string;
  rows: FuelTableRow[];
}

/**
 * Seed rows for a new organisation. The pressure bands follow the cranking bands quoted in the
 * trade from Jennings, Two-Stroke Tuner's Handbook (1973): about 120 psi for air-cooled engines,
 * 135–165 psi for best power, near 200 psi for water-cooled engines. Bounds are those psi
 * figures in kPa (125, 150, 175, 200 psi); the grades are common practice.
 */
export const DEFAULT_FUEL_TABLE: FuelTable = Object.freeze({
  label:
    "Common-practice defaults, not a specification: pressure bands as quoted in the trade, grades from common practice. Review with your engine builder and replace them with your own.",
  rows: Object.freeze(
    [
      { upToCrankingKpa: 862, grade: "Premium unleaded, 91 (R+M)/2, ethanol-free preferred", octaneAki: 91 },
      { upToCrankingKpa: 1034, grade: "Premium unleaded, 93 (R+M)/2, ethanol-free preferred", octaneAki: 93 },
      { upToCrankingKpa: 1207, grade: "Race fuel, about 100 (R+M)/2, or the builder's blend", octaneAki: 100 },
      { upToCrankingKpa: 1379, grade: "Race fuel, about 105 (R+M)/2 or higher, builder's choice", octaneAki: 105 },
    ].map((row) => Object.freeze(row)),
  ) as FuelTableRow[],
}) as FuelTable;

/** Gauge scatter the margin must clear (from memory: a cranking gauge repeats to ±3–5 %). */
export const GAUGE_SCATTER_SHARE = 0.05;

/** Checks a team's table and returns its rows in rising order of pressure. */
export function normalizeFuelTable(table: FuelTable | readonly FuelTableRow[]): FuelTable {
  const label = Array.isArray(table) ? "Your team's fuel table" : (table as FuelTable).label;
  const rows: readonly FuelTableRow[] = Array.isArray(table) ? table : (table as FuelTable).rows;
  if (!Array.isArray(rows) || rows.length === 0) {
    throw new DomainInputError("fuelTable", "fuelTable needs at least one row");
  }
  rows.forEach((row, i) => {
    requirePositive(`fuelTable[${i}].upToCrankingKpa`, row.upToCrankingKpa);
    if (typeof row.grade !== "string" || row.grade.trim() === "") {
      throw new DomainInputError(`fuelTable[${i}].grade`, "each fuel row needs a grade");
    }
    if (row.octaneAki !== undefined) requirePositive(`fuelTable[${i}].octaneAki`, row.octaneAki);
  });
  return {
    label: typeof label === "string" && label.trim() !== "" ? label : "Your team's fuel table",
    rows: [...rows].sort((a, b) => a.upToCrankingKpa - b.upToCrankingKpa),
  };
}

export interface FuelRowChoice {
  /** The first row whose bound the estimate does not pass; null above the whole table. */
  row: FuelTableRow | null;
  /** Bound − estimate, kPa: how far below the row the estimate sits (negative above the table). */
  marginKpa: number;
}

export function selectFuelRow(table: FuelTable | readonly FuelTableRow[], crankingKpaGauge: number): FuelRowChoice {
  const estimate = requireFinite("crankingKpaEstimate", crankingKpaGauge);
  const { rows } = normalizeFuelTable(table);
  const row = rows.find((r) => estimate <= r.upToCrankingKpa) ?? null;
  const bound = row ? row.upToCrankingKpa : rows[rows.length - 1].upToCrankingKpa;
  return { row, marginKpa: bound - estimate };
}

export type RiskFlagCode =
  | "built-for-altitude-at-low-event"
  | "fuel-below-build-minimum"
  | "above-fuel-table"
  | "margin-within-gauge-scatter"
  | "estimate-from-geometric-ratio";

export interface RiskFlag {
  code: RiskFlagCode;
  message: string;
}

export interface FuelRiskInput {
  elevationM: number;
  densityAltitudeM: number;
  crankingKpaGauge: number;
  choice: FuelRowChoice;
  ratioBasis: "trapped" | "geometric";
  /** The lowest elevation the engine was built for (altitude heads or inserts). */
  builtForMinElevationM?: number;
  /** The build sheet's minimum fuel, (R+M)/2. */
  buildMinOctaneAki?: number;
  /** The fuel the team plans to run, (R+M)/2; else the row's, when it has one. */
  fuelOctaneAki?: number;
}

function roundForText(value: number): string {
  return String(Math.round(value));
}

export function findFuelRisks(input: FuelRiskInput): RiskFlag[] {
  const flags: RiskFlag[] = [];
  if (input.builtForMinElevationM !== undefined) {
    const lowest = Math.min(input.elevationM, input.densityAltitudeM);
    if (lowest < input.builtForMinElevationM) {
      flags.push({
        code: "built-for-altitude-at-low-event",
        message: `Built for ${roundForText(input.builtForMinElevationM)} m and above, entered at ${roundForText(input.elevationM)} m (density altitude ${roundForText(input.densityAltitudeM)} m): the air is denser than the engine was built for and cylinder pressure will be higher.`,
      });
    }
  }
  const fuelOctane = input.fuelOctaneAki ?? input.choice.row?.octaneAki;
  if (input.buildMinOctaneAki !== undefined && fuelOctane !== undefined && fuelOctane < input.buildMinOctaneAki) {
    flags.push({
      code: "fuel-below-build-minimum",
      message: `The fuel (${fuelOctane} (R+M)/2) is below the build sheet's minimum of ${input.buildMinOctaneAki}.`,
    });
  }
  if (input.choice.row === null) {
    flags.push({
      code: "above-fuel-table",
      message: `The estimated cranking pressure of ${roundForText(input.crankingKpaGauge)} kPa is above every row of the fuel table: no row applies.`,
    });
  } else if (input.choice.marginKpa < GAUGE_SCATTER_SHARE * input.crankingKpaGauge) {
    flags.push({
      code: "margin-within-gauge-scatter",
      message: `The estimate sits within ${Math.round(GAUGE_SCATTER_SHARE * 100)} % of the row's upper bound, closer than a cranking gauge repeats: treat it as the next row.`,
    });
  }
  if (input.ratioBasis === "geometric") {
    flags.push({
      code: "estimate-from-geometric-ratio",
      message: "No exhaust timing was given, so the estimate uses the geometric ratio; on a two-stroke it reads far higher than the trapped ratio would.",
    });
  }
  return flags;
}
