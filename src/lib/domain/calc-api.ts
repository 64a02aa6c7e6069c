import { computeDensityAltitude, MAX_AIR_TEMP_C, MAX_ELEVATION_M, MIN_AIR_TEMP_C, MIN_ELEVATION_M, standardAtmosphere } from "./atmosphere";
import type { StandardAtmosphere } from "./atmosphere";
import { CAUTION_DEFAULT_FUEL_TABLE, FUEL_CAUTIONS } from "./cautions";
import {
  computeCcPerMm,
  computeChamberCcForRatio,
  computeGeometricRatio,
  computeSweptCc,
  computeTrappedRatioFromTravel,
  MAX_CYLINDERS,
} from "./compression";
import { DEFAULT_POLYTROPIC_EXPONENT, estimateCrankingKpa, MAX_POLYTROPIC_EXPONENT, MIN_POLYTROPIC_EXPONENT } from "./cranking";
import { DomainInputError } from "./errors";
import { DEFAULT_FUEL_TABLE, findFuelRisks, normalizeFuelTable, selectFuelRow } from "./fuel";
import type { FuelTable, FuelTableRow, RiskFlag } from "./fuel";
import { requireFinite, requireHalfTurnDeg, requireInRange, requirePositive, requirePositiveInteger } from "./input-guards";
import { computeExhaustDurationDeg, computeExhaustOpensFromTravelDeg, computeExhaustTravelMm } from "./slider-crank";

// The calculation routes of API.md as plain functions: the HTTP layer parses JSON, calls these
// and turns a DomainInputError (or the field map of find…InputErrors) into a 400.

export { DEFAULT_FUEL_TABLE };
export type { FuelTable, FuelTableRow, RiskFlag };

export interface CompressionInput {
  boreMm: number;
  strokeMm: number;
  chamberCc: number;
  cylinders?: number;
  rodMm?: number;
  exhaustOpensDegAtdc?: number;
  exhaustTravelMm?: number;
  flatPlateCc?: number;
  targetRatio?: number;
}

export interface CompressionResult {
  sweptCc: number;
  displacementCc: number;
  geometricRatio: number;
  exhaustTravelMm?: number;
  trappedSweptCc?: number;
  trappedRatio?: number;
  /** Echoed, or derived from the travel when the rod length is known. */
  exhaustOpensDegAtdc?: number;
  exhaustDurationDeg?: number;
  chamberOffsetCc?: number;
  targetChamberCc?: number;
  targetFlatPlateCc?: number;
  headCutMm?: number;
}

export interface FuelCheckInput extends CompressionInput {
  elevationM: number;
  airTempC?: number;
  fuelTable?: FuelTable | FuelTableRow[];
  /** The team's fitted exponent; else the cited default. */
  polytropicExponent?: number;
  builtForMinElevationM?: number;
  buildMinOctaneAki?: number;
  fuelOctaneAki?: number;
}

export interface FuelCheckResult extends CompressionResult {
  /** Standard-atmosphere pressure at the event's elevation, kPa absolute. */
  ambientKpa: number;
  /** The air temperature used: the one given, else the standard one at that elevation. */
  airTempC: number;
  densityAltitudeM: number;
  /** Standard pressure at the density altitude, kPa absolute: what the estimate starts from. */
  equivalentAmbientKpa: number;
  /** Estimated cranking pressure, kPa gauge. */
  crankingKpaEstimate: number;
  polytropicExponent: number;
  ratioBasis: "trapped" | "geometric";
  /** The row that applies, as the team wrote it; null above the whole table. */
  fuelGrade: string | null;
  /** Row bound − estimate, kPa; negative above the whole table. */
  margin: number;
  fuelTableLabel: string;
  riskFlags: RiskFlag[];
  cautions: string[];
}

export type AtmosphereResult = StandardAtmosphere;

export type FieldErrors = Record<string, string>;

function isGiven(value: unknown): boolean {
  return value !== undefined && value !== null;
}

function collect(errors: FieldErrors, check: () => void): void {
  try {
    check();
  } catch (error) {
    if (!(error instanceof DomainInputError)) throw error;
    if (!(error.field in errors)) errors[error.field] = error.message;
  }
}

function requireGiven(field: string, value: unknown): unknown {
  if (!isGiven(value)) throw new DomainInputError(field, `${field} is required`);
  return value;
}

/** Every bad field of a compression request at once, so a 400 can name them all. */
export function findCompressionInputErrors(input: Record<string, unknown>): FieldErrors {
  const errors: FieldErrors = {};
  collect(errors, () => requirePositive("boreMm", requireGiven("boreMm", input.boreMm)));
  collect(errors, () => requirePositive("strokeMm", requireGiven("strokeMm", input.strokeMm)));
  collect(errors, () => requirePositive("chamberCc", requireGiven("chamberCc", input.chamberCc)));
  const stroke = typeof input.strokeMm === "number" && input.strokeMm > 0 ? input.strokeMm : undefined;
  if (isGiven(input.cylinders)) collect(errors, () => requirePositiveInteger("cylinders", input.cylinders, MAX_CYLINDERS));
  if (isGiven(input.rodMm)) {
    collect(errors, () => {
      const rod = requirePositive("rodMm", input.rodMm);
      if (stroke !== undefined && rod <= stroke / 2) {
        throw new DomainInputError("rodMm", "rodMm must be longer than half the stroke");
      }
    });
  }
  if (isGiven(input.exhaustOpensDegAtdc)) {
    collect(errors, () => requireHalfTurnDeg("exhaustOpensDegAtdc", input.exhaustOpensDegAtdc));
    if (!isGiven(input.rodMm)) errors.rodMm ??= "rodMm is needed to place the exhaust port from its opening angle";
  }
  if (isGiven(input.exhaustTravelMm)) {
    collect(errors, () => requireInRange("exhaustTravelMm", input.exhaustTravelMm, 0, stroke ?? Infinity));
  }
  if (isGiven(input.flatPlateCc)) collect(errors, () => requirePositive("flatPlateCc", input.flatPlateCc));
  if (isGiven(input.targetRatio)) {
    collect(errors, () => {
      if (requireFinite("targetRatio", input.targetRatio) <= 1) {
        throw new DomainInputError("targetRatio", "targetRatio must be greater than 1");
      }
    });
  }
  return errors;
}

function throwFirst(errors: FieldErrors): void {
  const [field] = Object.keys(errors);
  if (field !== undefined) throw new DomainInputError(field, errors[field]);
}

/** POST /api/v1/calc/compression. Fields beyond the first three appear only when their inputs were given. */
export function computeCompression(input: CompressionInput): CompressionResult {
  throwFirst(findCompressionInputErrors(input as unknown as Record<string, unknown>));
  const { boreMm, strokeMm, chamberCc } = input;
  const sweptCc = computeSweptCc(boreMm, strokeMm);
  const result: CompressionResult = {
    sweptCc,
    displacementCc: sweptCc * (input.cylinders ?? 1),
    geometricRatio: computeGeometricRatio(sweptCc, chamberCc),
  };

  const rodMm = isGiven(input.rodMm) ? input.rodMm : undefined;
  let travelMm: number | undefined;
  if (isGiven(input.exhaustOpensDegAtdc) && rodMm !== undefined) {
    const opens = input.exhaustOpensDegAtdc as number;
    travelMm = computeExhaustTravelMm(strokeMm, rodMm, opens);
    result.exhaustOpensDegAtdc = opens;
  } else if (isGiven(input.exhaustTravelMm)) {
    travelMm = input.exhaustTravelMm as number;
    if (rodMm !== undefined) result.exhaustOpensDegAtdc = computeExhaustOpensFromTravelDeg(strokeMm, rodMm, travelMm);
  }
  if (travelMm !== undefined) {
    const trapped = computeTrappedRatioFromTravel({ boreMm, strokeMm, chamberCc, exhaustTravelMm: travelMm });
    result.exhaustTravelMm = trapped.exhaustTravelMm;
    result.trappedSweptCc = trapped.trappedSweptCc;
    result.trappedRatio = trapped.trappedRatio;
    if (result.exhaustOpensDegAtdc !== undefined) {
      result.exhaustDurationDeg = computeExhaustDurationDeg(result.exhaustOpensDegAtdc);
    }
  }

  const flatPlateCc = isGiven(input.flatPlateCc) ? input.flatPlateCc : undefined;
  if (flatPlateCc !== undefined) result.chamberOffsetCc = chamberCc - flatPlateCc;

  if (isGiven(input.targetRatio)) {
    const targetChamberCc = computeChamberCcForRatio(sweptCc, input.targetRatio as number);
    result.targetChamberCc = targetChamberCc;
    result.headCutMm = (chamberCc - targetChamberCc) / computeCcPerMm(boreMm);
    if (flatPlateCc !== undefined) {
      const targetFlatPlateCc = targetChamberCc - (chamberCc - flatPlateCc);
      if (!(targetFlatPlateCc > 0)) {
        throw new DomainInputError("targetRatio", "no head volume reaches this ratio with this chamber offset");
      }
      result.targetFlatPlateCc = targetFlatPlateCc;
    }
  }
  return result;
}

/** Every bad field of a fuel-check request at once. */
export function findFuelCheckInputErrors(input: Record<string, unknown>): FieldErrors {
  const errors = findCompressionInputErrors(input);
  collect(errors, () => requireInRange("elevationM", requireGiven("elevationM", input.elevationM), MIN_ELEVATION_M, MAX_ELEVATION_M));
  if (isGiven(input.airTempC)) collect(errors, () => requireInRange("airTempC", input.airTempC, MIN_AIR_TEMP_C, MAX_AIR_TEMP_C));
  if (isGiven(input.polytropicExponent)) {
    collect(errors, () =>
      requireInRange("polytropicExponent", input.polytropicExponent, MIN_POLYTROPIC_EXPONENT, MAX_POLYTROPIC_EXPONENT),
    );
  }
  if (isGiven(input.builtForMinElevationM)) {
    collect(errors, () => requireInRange("builtForMinElevationM", input.builtForMinElevationM, MIN_ELEVATION_M, MAX_ELEVATION_M));
  }
  if (isGiven(input.buildMinOctaneAki)) collect(errors, () => requirePositive("buildMinOctaneAki", input.buildMinOctaneAki));
  if (isGiven(input.fuelOctaneAki)) collect(errors, () => requirePositive("fuelOctaneAki", input.fuelOctaneAki));
  if (isGiven(input.fuelTable)) {
    collect(errors, () => {
      if (typeof input.fuelTable !== "object") throw new DomainInputError("fuelTable", "fuelTable must be a table of rows");
      normalizeFuelTable(input.fuelTable as FuelTable | FuelTableRow[]);
    });
  }
  return errors;
}

/** POST /api/v1/calc/fuel-check. */
export function computeFuelCheck(input: FuelCheckInput): FuelCheckResult {
  throwFirst(findFuelCheckInputErrors(input as unknown as Record<string, unknown>));
  const compression = computeCompression(input);
  const here = standardAtmosphere(input.elevationM);
  const airTempC = isGiven(input.airTempC) ? (input.airTempC as number) : here.temperatureC;
  const density = computeDensityAltitude(input.elevationM, airTempC);
  const ratioBasis = compression.trappedRatio === undefined ? "geometric" : "trapped";
  const ratio = compression.trappedRatio ?? compression.geometricRatio;
  const polytropicExponent = isGiven(input.polytropicExponent)
    ? (input.polytropicExponent as number)
    : DEFAULT_POLYTROPIC_EXPONENT;
  const estimate = estimateCrankingKpa(density.equivalentPressureKpa, ratio, polytropicExponent);

  const usesDefaultTable = !isGiven(input.fuelTable);
  const table = normalizeFuelTable(usesDefaultTable ? DEFAULT_FUEL_TABLE : (input.fuelTable as FuelTable | FuelTableRow[]));
  const choice = selectFuelRow(table, estimate.gaugeKpa);
  const riskFlags = findFuelRisks({
    elevationM: input.elevationM,
    densityAltitudeM: density.densityAltitudeM,
    crankingKpaGauge: estimate.gaugeKpa,
    choice,
    ratioBasis,
    builtForMinElevationM: isGiven(input.builtForMinElevationM) ? input.builtForMinElevationM : undefined,
    buildMinOctaneAki: isGiven(input.buildMinOctaneAki) ? input.buildMinOctaneAki : undefined,
    fuelOctaneAki: isGiven(input.fuelOctaneAki) ? input.fuelOctaneAki : undefined,
  });

  return {
    ...compression,
    ambientKpa: here.pressureKpa,
    airTempC,
    densityAltitudeM: density.densityAltitudeM,
    equivalentAmbientKpa: density.equivalentPressureKpa,
    crankingKpaEstimate: estimate.gaugeKpa,
    polytropicExponent,
    ratioBasis,
    fuelGrade: choice.row ? choice.row.grade : null,
    margin: choice.marginKpa,
    fuelTableLabel: table.label,
    riskFlags,
    cautions: usesDefaultTable ? [...FUEL_CAUTIONS, CAUTION_DEFAULT_FUEL_TABLE] : [...FUEL_CAUTIONS],
  };
}

/** GET /api/v1/calc/atmosphere: the elevation is geometric, above sea level. */
export function computeAtmosphere(input: { elevationM: unknown }): AtmosphereResult {
  const elevationM = requireInRange("elevationM", requireGiven("elevationM", input.elevationM), MIN_ELEVATION_M, MAX_ELEVATION_M);
  return standardAtmosphere(elevationM);
}
