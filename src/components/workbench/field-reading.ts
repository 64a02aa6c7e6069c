import { convertToSi } from "../../lib/domain/units.ts";
import { FIELD_QUANTITY, parseTypedNumber, type TextField, type WorkbenchState } from "./workbench-state.ts";

// Typed text in, domain numbers out; domain messages back onto the field that caused them,
// in the words of the form ("Rod length must be longer…", not "rodMm must be longer…").

export const FIELD_LABEL: Record<TextField, string> = {
  bore: "Bore",
  stroke: "Stroke",
  rod: "Rod length",
  cylinders: "Cylinders",
  chamber: "Installed chamber volume",
  plate: "Flat-plate head volume",
  offset: "Chamber offset",
  squish: "Squish clearance",
  exhaustOpens: "Exhaust opens",
  exhaustDuration: "Exhaust duration",
  exhaustTravel: "Travel to port edge",
  target: "Target geometric ratio",
  elevation: "Elevation",
  airTemp: "Air temperature",
  exponent: "Exponent n",
  builtForMinElevation: "Built for elevations from",
  buildMinOctane: "Build sheet minimum octane",
  fuelOctane: "Fuel you plan to run",
};

export type FieldErrors = Partial<Record<TextField, string>>;

function humanize(message: string, apiField: string, label: string): string {
  const text = message.replace(apiField, label);
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** Reads one typed field into domain units; a malformed value is reported, an empty one is undefined. */
export function readField(state: WorkbenchState, field: TextField, errors: FieldErrors): number | undefined {
  const value = parseTypedNumber(state[field]);
  if (value === undefined) return undefined;
  if (!Number.isFinite(value)) {
    errors[field] = "Enter a number, such as 72 or 73.8.";
    return undefined;
  }
  const quantity = FIELD_QUANTITY[field];
  return quantity === null ? value : convertToSi(quantity, value, state.units);
}

function apiFieldMap(state: WorkbenchState): Record<string, TextField> {
  return {
    boreMm: "bore",
    strokeMm: "stroke",
    rodMm: "rod",
    cylinders: "cylinders",
    chamberCc: state.chamberMode === "installed" ? "chamber" : "offset",
    flatPlateCc: "plate",
    exhaustOpensDegAtdc: state.exhaustMode === "duration" ? "exhaustDuration" : "exhaustOpens",
    exhaustTravelMm: "exhaustTravel",
    targetRatio: "target",
    sweptCc: "bore",
    elevationM: "elevation",
    airTempC: "airTemp",
    polytropicExponent: "exponent",
    builtForMinElevationM: "builtForMinElevation",
    buildMinOctaneAki: "buildMinOctane",
    fuelOctaneAki: "fuelOctane",
  };
}

export function addDomainErrors(state: WorkbenchState, found: Record<string, string>, errors: FieldErrors): void {
  const map = apiFieldMap(state);
  for (const [apiField, message] of Object.entries(found)) {
    const field = map[apiField];
    // "is required" means empty (listed as missing) or not a number (already said on the field).
    if (message.endsWith("is required")) continue;
    if (field && !errors[field]) errors[field] = humanize(message, apiField, FIELD_LABEL[field]);
  }
}
