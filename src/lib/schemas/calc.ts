import { z } from "zod";
import { MAX_AIR_TEMP_C, MAX_ELEVATION_M, MIN_AIR_TEMP_C, MIN_ELEVATION_M } from "../domain/atmosphere.ts";
import { findCompressionInputErrors, findFuelCheckInputErrors } from "../domain/calc-api.ts";
import { MAX_CYLINDERS } from "../domain/compression.ts";
import { MAX_POLYTROPIC_EXPONENT, MIN_POLYTROPIC_EXPONENT } from "../domain/cranking.ts";

// The calculation routes of API.md. Zod checks each field on its own (type, range); the domain's
// find…InputErrors adds the checks between fields (rod against stroke, port edge within the
// stroke). Both run on every request, so one 400 names every bad field. Unknown fields are
// refused by name (docs/decisions/010-calc-api-refuses-unknown-fields.md); null means "not given".

/** Limits generous enough for any piston engine, small enough that no figure can overflow. */
export const MIN_LENGTH_MM = 0.001;
export const MIN_VOLUME_CC = 0.001;
export const MAX_BORE_MM = 1000;
export const MAX_STROKE_MM = 3000;
export const MAX_ROD_MM = 10_000;
export const MAX_CHAMBER_CC = 1_000_000;
export const MAX_TARGET_RATIO = 100;
export const MAX_OCTANE_AKI = 150;
export const MAX_FUEL_ROWS = 50;
export const MAX_FUEL_TEXT = 200;
export const MAX_FUEL_BOUND_KPA = 100_000;
export const MAX_DRIFT_VALUES = 10_000;
export const MAX_DRIFT_MAGNITUDE = 1e9;
export const MAX_EWMA_WIDTH = 10;

interface NumberRule {
  min?: number;
  /** true: the value must be strictly above min. */
  aboveMin?: boolean;
  max?: number;
  integer?: boolean;
}

function describeRange(rule: NumberRule): string {
  if (rule.aboveMin && rule.min === 0 && rule.max !== undefined) return `greater than 0 and at most ${rule.max}`;
  if (rule.min !== undefined && rule.max !== undefined) return `between ${rule.min} and ${rule.max}`;
  if (rule.max !== undefined) return `at most ${rule.max}`;
  return "a finite number";
}

/** A JSON number within a range; the messages name the field, as the domain's do. */
export function numberField(field: string, rule: NumberRule = {}): z.ZodNumber {
  let schema = z.number({
    error: (issue) => (issue.input === undefined ? `${field} is required` : `${field} must be a number`),
  });
  const range = describeRange(rule);
  if (rule.integer) schema = schema.int({ error: `${field} must be a whole number` });
  if (rule.min !== undefined) {
    schema = rule.aboveMin
      ? schema.gt(rule.min, { error: `${field} must be ${range}` })
      : schema.gte(rule.min, { error: `${field} must be ${range}` });
  }
  if (rule.max !== undefined) schema = schema.lte(rule.max, { error: `${field} must be ${range}` });
  return schema;
}

const positive = (field: string, max: number): z.ZodNumber => numberField(field, { min: 0, aboveMin: true, max });
// A micrometre and a microlitre: far below anything measured, far above where products underflow.
const length = (field: string, max: number): z.ZodNumber => numberField(field, { min: MIN_LENGTH_MM, max });
const volume = (field: string): z.ZodNumber => numberField(field, { min: MIN_VOLUME_CC, max: MAX_CHAMBER_CC });
const optional = <T extends z.ZodType>(schema: T) => schema.nullish();

export const compressionFields = {
  boreMm: length("boreMm", MAX_BORE_MM),
  strokeMm: length("strokeMm", MAX_STROKE_MM),
  chamberCc: volume("chamberCc"),
  cylinders: optional(numberField("cylinders", { min: 1, max: MAX_CYLINDERS, integer: true })),
  rodMm: optional(length("rodMm", MAX_ROD_MM)),
  exhaustOpensDegAtdc: optional(numberField("exhaustOpensDegAtdc", { min: 0, max: 180 })),
  exhaustTravelMm: optional(numberField("exhaustTravelMm", { min: 0, max: MAX_STROKE_MM })),
  flatPlateCc: optional(volume("flatPlateCc")),
  targetRatio: optional(numberField("targetRatio", { min: 1, aboveMin: true, max: MAX_TARGET_RATIO })),
};

const fuelRowSchema = z.strictObject({
  upToCrankingKpa: positive("upToCrankingKpa", MAX_FUEL_BOUND_KPA),
  grade: z.string({ error: "grade must be text" }).trim().min(1, "each fuel row needs a grade").max(MAX_FUEL_TEXT),
  octaneAki: positive("octaneAki", MAX_OCTANE_AKI).optional(),
});
const fuelRowsSchema = z.array(fuelRowSchema).min(1, "fuelTable needs at least one row").max(MAX_FUEL_ROWS);

export const fuelTableSchema = z.union(
  [fuelRowsSchema, z.strictObject({ label: z.string().trim().max(MAX_FUEL_TEXT), rows: fuelRowsSchema })],
  { error: "fuelTable must be a list of rows, or { label, rows }" },
);

export const fuelCheckFields = {
  ...compressionFields,
  elevationM: numberField("elevationM", { min: MIN_ELEVATION_M, max: MAX_ELEVATION_M }),
  airTempC: optional(numberField("airTempC", { min: MIN_AIR_TEMP_C, max: MAX_AIR_TEMP_C })),
  fuelTable: optional(fuelTableSchema),
  polytropicExponent: optional(numberField("polytropicExponent", { min: MIN_POLYTROPIC_EXPONENT, max: MAX_POLYTROPIC_EXPONENT })),
  builtForMinElevationM: optional(numberField("builtForMinElevationM", { min: MIN_ELEVATION_M, max: MAX_ELEVATION_M })),
  buildMinOctaneAki: optional(positive("buildMinOctaneAki", MAX_OCTANE_AKI)),
  fuelOctaneAki: optional(positive("fuelOctaneAki", MAX_OCTANE_AKI)),
};

export const driftFields = {
  values: z
    .array(numberField("each reading", { min: -MAX_DRIFT_MAGNITUDE, max: MAX_DRIFT_MAGNITUDE }), {
      error: (issue) => (issue.input === undefined ? "values is required" : "values must be a list of numbers"),
    })
    .min(1, "values must hold at least one reading")
    .max(MAX_DRIFT_VALUES, `values may hold at most ${MAX_DRIFT_VALUES} readings`),
  target: numberField("target", { min: -MAX_DRIFT_MAGNITUDE, max: MAX_DRIFT_MAGNITUDE }),
  sigma: positive("sigma", MAX_DRIFT_MAGNITUDE),
  lambda: optional(numberField("lambda", { min: 0, aboveMin: true, max: 1 })),
  width: optional(positive("width", MAX_EWMA_WIDTH)),
  tolerance: optional(numberField("tolerance", { min: 0, max: MAX_DRIFT_MAGNITUDE })),
};

type FieldErrorFinder = (input: Record<string, unknown>) => Record<string, string>;

/**
 * An object of known fields that also runs the domain's cross-field checks and names unknown
 * fields, whether or not the single-field checks passed (`when`), so nothing is reported late.
 */
function requestSchema<S extends z.ZodRawShape>(shape: S, findDomainErrors?: FieldErrorFinder) {
  const known = new Set(Object.keys(shape));
  return (
    z
      // loose: unknown keys must survive parsing to be named below.
      .looseObject(shape, { error: "the body must be a JSON object" })
      .superRefine(
        (value, ctx) => {
          if (typeof value !== "object" || value === null || Array.isArray(value)) return;
          const raw = value as Record<string, unknown>;
          for (const key of Object.keys(raw)) {
            if (!known.has(key)) ctx.addIssue({ code: "custom", path: [key], message: `${key} is not a field of this request` });
          }
          if (!findDomainErrors) return;
          for (const [field, message] of Object.entries(findDomainErrors(raw))) {
            // A field zod already refused keeps zod's message, so each field is named once.
            const root = field.split(/[.[]/)[0];
            const own = shape[root] as z.ZodType | undefined;
            if (own && !own.safeParse(raw[root]).success) continue;
            ctx.addIssue({ code: "custom", path: [field], message });
          }
        },
        { when: (payload) => typeof payload.value === "object" && payload.value !== null && !Array.isArray(payload.value) },
      )
  );
}

export const compressionRequestSchema = requestSchema(compressionFields, findCompressionInputErrors);
export const fuelCheckRequestSchema = requestSchema(fuelCheckFields, findFuelCheckInputErrors);
export const driftRequestSchema = requestSchema(driftFields);

/** A query-string number: digits, an optional sign, decimals and exponent; never "", hex or "NaN". */
const NUMBER_TEXT = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

export const atmosphereQuerySchema = requestSchema({
  elevationM: z
    .string({ error: "elevationM is required" })
    .trim()
    .regex(NUMBER_TEXT, "elevationM must be a number of metres")
    .transform(Number)
    .pipe(numberField("elevationM", { min: MIN_ELEVATION_M, max: MAX_ELEVATION_M })),
});

export type CompressionRequest = z.infer<typeof compressionRequestSchema>;
export type FuelCheckRequest = z.infer<typeof fuelCheckRequestSchema>;
export type DriftRequest = z.infer<typeof driftRequestSchema>;

/** Drops the fields sent as null, which mean "not given". */
export function omitNulls<T extends Record<string, unknown>>(input: T): { [K in keyof T]: Exclude<T[K], null> } {
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(input)) if (value !== null && value !== undefined) out[key] = value;
  return out as { [K in keyof T]: Exclude<T[K], null> };
}
