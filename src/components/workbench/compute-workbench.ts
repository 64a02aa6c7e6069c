import {
  computeCompression,
  computeFuelCheck,
  findCompressionInputErrors,
  findFuelCheckInputErrors,
  type CompressionInput,
  type CompressionResult,
  type FuelCheckInput,
  type FuelCheckResult,
} from "../../lib/domain/calc-api.ts";
import type { FuelTable } from "../../lib/domain/fuel.ts";
import { DomainInputError } from "../../lib/domain/errors.ts";
import { computeExhaustOpensDegAtdc } from "../../lib/domain/slider-crank.ts";
import { addDomainErrors, FIELD_LABEL, readField, type FieldErrors } from "./field-reading.ts";
import { planChange, type PlanOutcome } from "./plan-change.ts";
import type { TextField, WorkbenchState } from "./workbench-state.ts";

export { FIELD_LABEL, type FieldErrors, type PlanOutcome };

// The Workbench's figures, computed in the browser with the same pure module the API uses.
// Nothing here throws: every problem becomes a message on the field that caused it.

export interface WorkbenchFigures {
  errors: FieldErrors;
  /** Labels of required fields still empty. */
  missing: string[];
  compressionInput?: CompressionInput;
  compression?: CompressionResult;
  /** The installed chamber volume used, cc (typed, or flat plate + offset). */
  chamberCc?: number;
  plan?: PlanOutcome;
  fuelBefore?: FuelCheckResult;
  fuelAfter?: FuelCheckResult;
  /** Why there is no fuel check yet. */
  fuelMissing?: string;
}

function readCompressionInput(state: WorkbenchState, errors: FieldErrors, missing: string[]): CompressionInput | undefined {
  const boreMm = readField(state, "bore", errors);
  const strokeMm = readField(state, "stroke", errors);
  const rodMm = readField(state, "rod", errors);
  const cylinders = readField(state, "cylinders", errors);
  const targetRatio = readField(state, "target", errors);
  const plateCc = readField(state, "plate", errors);
  let chamberCc: number | undefined;
  if (state.chamberMode === "installed") {
    chamberCc = readField(state, "chamber", errors);
    if (state.chamber.trim() === "") missing.push(FIELD_LABEL.chamber);
  } else {
    const offsetCc = readField(state, "offset", errors);
    if (state.plate.trim() === "") missing.push(FIELD_LABEL.plate);
    if (state.offset.trim() === "") missing.push(FIELD_LABEL.offset);
    if (plateCc !== undefined && offsetCc !== undefined) {
      chamberCc = plateCc + offsetCc;
      if (!(chamberCc > 0)) errors.offset = "This flat-plate volume and offset leave no chamber volume.";
    }
  }
  if (state.bore.trim() === "") missing.unshift(FIELD_LABEL.bore);
  if (state.stroke.trim() === "") missing.splice(state.bore.trim() === "" ? 1 : 0, 0, FIELD_LABEL.stroke);

  const input: CompressionInput = { boreMm: boreMm as number, strokeMm: strokeMm as number, chamberCc: chamberCc as number };
  if (cylinders !== undefined) input.cylinders = cylinders;
  if (rodMm !== undefined) input.rodMm = rodMm;
  if (plateCc !== undefined) input.flatPlateCc = plateCc;
  if (targetRatio !== undefined) input.targetRatio = targetRatio;
  if (state.exhaustMode === "opens") {
    const opens = readField(state, "exhaustOpens", errors);
    if (opens !== undefined) input.exhaustOpensDegAtdc = opens;
  } else if (state.exhaustMode === "duration") {
    const duration = readField(state, "exhaustDuration", errors);
    if (duration !== undefined) {
      if (duration < 0 || duration > 360) errors.exhaustDuration = "Exhaust duration must lie between 0 and 360°.";
      else input.exhaustOpensDegAtdc = computeExhaustOpensDegAtdc(duration);
    }
  } else {
    const travel = readField(state, "exhaustTravel", errors);
    if (travel !== undefined) input.exhaustTravelMm = travel;
  }
  return missing.length === 0 ? input : undefined;
}

// sweptCc is refused only when bore and stroke multiply below the smallest double.
const REQUIRED_INPUTS = ["boreMm", "strokeMm", "chamberCc", "elevationM", "sweptCc"];

/**
 * The input without the optional fields that were refused, so the figures that can be computed
 * still show while one field is wrong. An angle without a usable rod cannot place the port.
 */
function dropRefused<T extends CompressionInput>(input: T, refused: Record<string, string>): T | undefined {
  if (REQUIRED_INPUTS.some((key) => key in refused)) return undefined;
  const kept: Record<string, unknown> = { ...(input as Record<string, unknown>) };
  for (const key of Object.keys(refused)) delete kept[key];
  if ("rodMm" in refused) delete kept.exhaustOpensDegAtdc;
  return kept as T;
}

function readFuelExtras(
  state: WorkbenchState,
  errors: FieldErrors,
  fuelTable: FuelTable | null,
): Omit<FuelCheckInput, keyof CompressionInput> | undefined {
  const elevationM = readField(state, "elevation", errors);
  const extras: Omit<FuelCheckInput, keyof CompressionInput> = { elevationM: elevationM as number };
  if (fuelTable) extras.fuelTable = fuelTable;
  const optional: [TextField, keyof FuelCheckInput][] = [
    ["airTemp", "airTempC"],
    ["exponent", "polytropicExponent"],
    ["builtForMinElevation", "builtForMinElevationM"],
    ["buildMinOctane", "buildMinOctaneAki"],
    ["fuelOctane", "fuelOctaneAki"],
  ];
  for (const [field, key] of optional) {
    const value = readField(state, field, errors);
    if (value !== undefined) (extras as unknown as Record<string, number>)[key] = value;
  }
  return elevationM === undefined ? undefined : extras;
}

const FUEL_FIELDS: TextField[] = ["elevation", "airTemp", "exponent", "builtForMinElevation", "buildMinOctane", "fuelOctane"];

// Unlike the compression figures, a fuel check is never shown with a refused field left out:
// a default standing in for a mistyped temperature or octane could mislead a fuel call.
function checkFuel(input: FuelCheckInput, state: WorkbenchState, errors: FieldErrors): FuelCheckResult | undefined {
  const found = findFuelCheckInputErrors(input as unknown as Record<string, unknown>);
  addDomainErrors(state, found, errors);
  if (Object.keys(found).length > 0 || FUEL_FIELDS.some((f) => errors[f])) return undefined;
  const result = computeDropping(input, state, errors, computeFuelCheck);
  return FUEL_FIELDS.some((f) => errors[f]) ? undefined : result;
}

/**
 * Runs a domain computation; a DomainInputError the up-front checks could not foresee (a target
 * no head reaches with this offset) goes on its field, and the computation runs again without
 * that optional field. Nothing here throws at the person typing.
 */
function computeDropping<I extends CompressionInput, R>(
  input: I,
  state: WorkbenchState,
  errors: FieldErrors,
  compute: (input: I) => R,
): R | undefined {
  let current: I | undefined = input;
  for (let attempt = 0; current && attempt < 4; attempt += 1) {
    try {
      return compute(current);
    } catch (error) {
      if (!(error instanceof DomainInputError)) throw error;
      const refused = { [error.field]: error.message };
      addDomainErrors(state, refused, errors);
      current = dropRefused(current, refused);
    }
  }
  return undefined;
}

/** `fuelTable`: the organisation's own table; without it the seed defaults apply, with their caution. */
export function computeWorkbench(state: WorkbenchState, fuelTable: FuelTable | null = null): WorkbenchFigures {
  const errors: FieldErrors = {};
  const missing: string[] = [];
  const rawInput = readCompressionInput(state, errors, missing);
  const figures: WorkbenchFigures = { errors, missing };
  const extras = readFuelExtras(state, errors, fuelTable);
  if (!extras) figures.fuelMissing = "Enter the elevation to see the fuel check.";
  if (!rawInput) return figures;

  const found = findCompressionInputErrors(rawInput as unknown as Record<string, unknown>);
  addDomainErrors(state, found, errors);
  const input = dropRefused(rawInput, found);
  if (!input) return figures;
  figures.compressionInput = input;
  figures.compression = computeDropping(input, state, errors, computeCompression);
  if (!figures.compression) return figures;
  figures.chamberCc = input.chamberCc;
  figures.plan = computeDropping(input, state, errors, (usable) => planChange(state, usable, errors));

  if (!extras) return figures;
  figures.fuelBefore = checkFuel({ ...input, ...extras }, state, errors);
  const plan = figures.plan;
  if (figures.fuelBefore && plan && plan.appliedSteps > 0) {
    const after: FuelCheckInput = {
      boreMm: input.boreMm,
      strokeMm: input.strokeMm,
      chamberCc: plan.after.chamberCc,
      ...extras,
    };
    if (input.cylinders !== undefined) after.cylinders = input.cylinders;
    if (plan.after.exhaustTravelMm !== undefined) after.exhaustTravelMm = plan.after.exhaustTravelMm;
    figures.fuelAfter = checkFuel(after, state, errors);
  }
  return figures;
}
