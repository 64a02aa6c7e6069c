import { convertFromSi, convertToSi, type QuantityKind, type UnitChoice } from "../../lib/domain/units.ts";
import { isUnitOption, UNIT_QUANTITIES, type UnitQuantity } from "../../lib/unit-preferences.ts";

// Everything the Workbench shows follows from this state, and the whole state lives in the
// page's query string so a result can be shared, bookmarked or printed. Values are kept as
// the person typed them, in the units they typed them in; the units travel with them.

export type ChamberMode = "installed" | "plate";
export type ExhaustMode = "opens" | "duration" | "travel";
export type PlanStepKind = "cut" | "gasket" | "bowl" | "keep";

export interface PlanStep {
  id: number;
  kind: PlanStepKind;
  /** Typed in the length unit (cut, gasket, keep) or the volume unit (bowl). */
  value: string;
}

export const TEXT_FIELDS = [
  "bore",
  "stroke",
  "rod",
  "cylinders",
  "chamber",
  "plate",
  "offset",
  "squish",
  "exhaustOpens",
  "exhaustDuration",
  "exhaustTravel",
  "target",
  "elevation",
  "airTemp",
  "exponent",
  "builtForMinElevation",
  "buildMinOctane",
  "fuelOctane",
] as const;
export type TextField = (typeof TEXT_FIELDS)[number];

/** What a field held before its units last changed, so switching back restores the typed text. */
export interface TypedMemory {
  unit: string;
  text: string;
  /** The converted text shown since; once edited, the memory no longer applies. */
  shown: string;
}

export type WorkbenchState = { [K in TextField]: string } & {
  units: UnitChoice;
  chamberMode: ChamberMode;
  exhaustMode: ExhaustMode;
  plan: PlanStep[];
  /** Per field name or "step:<id>"; not part of the address (a reload keeps the converted text). */
  memory: Record<string, TypedMemory>;
};

/** The quantity each field holds, for unit conversion; null for counts, angles and plain numbers. */
export const FIELD_QUANTITY: Record<TextField, QuantityKind | null> = {
  bore: "length",
  stroke: "length",
  rod: "length",
  cylinders: null,
  chamber: "volume",
  plate: "volume",
  offset: "volume",
  squish: "squish",
  exhaustOpens: null,
  exhaustDuration: null,
  exhaustTravel: "length",
  target: null,
  elevation: "elevation",
  airTemp: "temperature",
  exponent: null,
  builtForMinElevation: "elevation",
  buildMinOctane: null,
  fuelOctane: null,
};

/** Short, readable query names: ?bore=72&stroke=73.8&… */
const QUERY_NAME: Record<TextField, string> = {
  bore: "bore",
  stroke: "stroke",
  rod: "rod",
  cylinders: "cyl",
  chamber: "chamber",
  plate: "plate",
  offset: "offset",
  squish: "squish",
  exhaustOpens: "eo",
  exhaustDuration: "dur",
  exhaustTravel: "travel",
  target: "target",
  elevation: "elev",
  airTemp: "air",
  exponent: "n",
  builtForMinElevation: "minElev",
  buildMinOctane: "minOct",
  fuelOctane: "fuelOct",
};

export const PLAN_STEP_KINDS: readonly PlanStepKind[] = ["cut", "gasket", "bowl", "keep"];
const MAX_TYPED_LENGTH = 24;
const MAX_PLAN_STEPS = 12;

export function createEmptyState(units: UnitChoice): WorkbenchState {
  const text = Object.fromEntries(TEXT_FIELDS.map((f) => [f, ""])) as { [K in TextField]: string };
  return { ...text, cylinders: "1", units: { ...units }, chamberMode: "installed", exhaustMode: "opens", plan: [], memory: {} };
}

/** "1,2" is read as 1.2 (many shops write a decimal comma); anything else must be a plain number. */
export function parseTypedNumber(text: string): number | undefined {
  const trimmed = text.trim();
  if (trimmed === "") return undefined;
  const normal = /^[-+]?\d+,\d+$/.test(trimmed) ? trimmed.replace(",", ".") : trimmed;
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(normal)) return Number.NaN;
  return Number(normal);
}

// Enough decimals that switching units back and forth returns what was typed.
const CONVERSION_DECIMALS: Record<string, number> = {
  mm: 3,
  in: 5,
  cc: 3,
  in3: 5,
  kPa: 1,
  bar: 3,
  psi: 1,
  m: 2,
  ft: 1,
  C: 2,
  F: 1,
};

function unitOf(kind: QuantityKind, units: UnitChoice): string {
  if (kind === "length" || kind === "squish") return units.length;
  if (kind === "volume") return units.volume;
  if (kind === "pressure") return units.pressure;
  if (kind === "elevation") return units.elevation;
  if (kind === "temperature") return units.temperature;
  return "";
}

/** Plain decimal text without trailing zeros and never "-0". */
export function formatTyped(value: number, decimals: number): string {
  const fixed = value.toFixed(decimals);
  const trimmed = fixed.includes(".") ? fixed.replace(/\.?0+$/, "") : fixed;
  return trimmed === "-0" ? "0" : trimmed;
}

/** A domain value (mm, cc, kPa, m, °C) as text to type in the person's unit. */
export function formatForUnits(kind: QuantityKind, siValue: number, units: UnitChoice): string {
  return formatTyped(convertFromSi(kind, siValue, units), CONVERSION_DECIMALS[unitOf(kind, units)] ?? 3);
}

/** Re-expresses a typed value in other units; text that is not a number is left as it is. */
export function convertTypedValue(text: string, kind: QuantityKind | null, from: UnitChoice, to: UnitChoice): string {
  if (kind === null) return text;
  const value = parseTypedNumber(text);
  if (value === undefined || !Number.isFinite(value)) return text;
  const toUnit = unitOf(kind, to);
  if (unitOf(kind, from) === toUnit) return text;
  return formatTyped(convertFromSi(kind, convertToSi(kind, value, from), to), CONVERSION_DECIMALS[toUnit] ?? 3);
}

export function getStepQuantity(kind: PlanStepKind): QuantityKind {
  return kind === "bowl" ? "volume" : "squish";
}

/**
 * Rounding on each conversion would drift a value switched back and forth (7178 m → 23549.2 ft
 * → 7178.01 m), so a value switched back to the unit it was typed in, unedited, gets its typed
 * text back.
 */
function carryValue(
  key: string,
  text: string,
  kind: QuantityKind | null,
  from: UnitChoice,
  to: UnitChoice,
  memory: Record<string, TypedMemory>,
  nextMemory: Record<string, TypedMemory>,
): string {
  if (kind === null || unitOf(kind, from) === unitOf(kind, to)) {
    if (memory[key]) nextMemory[key] = memory[key];
    return text;
  }
  const remembered = memory[key];
  if (remembered && remembered.unit === unitOf(kind, to) && remembered.shown === text) return remembered.text;
  const converted = convertTypedValue(text, kind, from, to);
  if (converted !== text) nextMemory[key] = { unit: unitOf(kind, from), text, shown: converted };
  return converted;
}

/** New units for the whole state: every typed value is carried over to them. */
export function changeUnits(state: WorkbenchState, units: UnitChoice): WorkbenchState {
  const memory: Record<string, TypedMemory> = {};
  const next: WorkbenchState = { ...state, units: { ...units }, memory };
  for (const field of TEXT_FIELDS) {
    next[field] = carryValue(field, state[field], FIELD_QUANTITY[field], state.units, units, state.memory, memory);
  }
  next.plan = state.plan.map((s) => ({
    ...s,
    value: carryValue(`step:${s.id}`, s.value, getStepQuantity(s.kind), state.units, units, state.memory, memory),
  }));
  return next;
}

export function serializeState(state: WorkbenchState): string {
  const params = new URLSearchParams();
  params.set("u", UNIT_QUANTITIES.map((q) => state.units[q]).join("."));
  for (const field of TEXT_FIELDS) {
    const value = state[field].trim();
    if (value !== "") params.set(QUERY_NAME[field], value);
  }
  if (state.chamberMode !== "installed") params.set("cm", state.chamberMode);
  if (state.exhaustMode !== "opens") params.set("em", state.exhaustMode);
  if (state.plan.length > 0) params.set("plan", state.plan.map((s) => `${s.kind}:${s.value.trim()}`).join(","));
  return params.toString();
}

function parseUnits(text: string | null, fallback: UnitChoice): { units: UnitChoice; fromQuery: boolean } {
  if (!text) return { units: fallback, fromQuery: false };
  const parts = text.split(".");
  const units = { ...fallback };
  UNIT_QUANTITIES.forEach((quantity: UnitQuantity, i) => {
    const part = parts[i];
    if (isUnitOption(quantity, part)) (units as Record<UnitQuantity, string>)[quantity] = part;
  });
  return { units, fromQuery: true };
}

function parsePlan(text: string | null): PlanStep[] {
  if (!text) return [];
  return text
    .split(",")
    .slice(0, MAX_PLAN_STEPS)
    .flatMap((part, i) => {
      const [kind, value = ""] = part.split(":");
      return (PLAN_STEP_KINDS as readonly string[]).includes(kind)
        ? [{ id: i + 1, kind: kind as PlanStepKind, value: value.slice(0, MAX_TYPED_LENGTH) }]
        : [];
    });
}

export interface ParsedQuery {
  state: WorkbenchState;
  /** True when the query carried values; the page's own defaults then stay out of the way. */
  hasValues: boolean;
  unitsFromQuery: boolean;
}

/** Reads a query string (with or without "?"); unknown or malformed parts are ignored. */
export function parseQuery(search: string, fallbackUnits: UnitChoice): ParsedQuery {
  const params = new URLSearchParams(search.startsWith("?") ? search.slice(1) : search);
  const { units, fromQuery } = parseUnits(params.get("u"), fallbackUnits);
  const state = createEmptyState(units);
  let hasValues = false;
  for (const field of TEXT_FIELDS) {
    const value = params.get(QUERY_NAME[field]);
    if (value !== null) {
      state[field] = value.slice(0, MAX_TYPED_LENGTH);
      hasValues = true;
    }
  }
  if (params.get("cm") === "plate") state.chamberMode = "plate";
  const em = params.get("em");
  if (em === "duration" || em === "travel") state.exhaustMode = em;
  state.plan = parsePlan(params.get("plan"));
  if (state.plan.length > 0) hasValues = true;
  return { state, hasValues, unitsFromQuery: fromQuery };
}

export function nextStepId(plan: readonly PlanStep[]): number {
  return plan.reduce((max, s) => Math.max(max, s.id), 0) + 1;
}
