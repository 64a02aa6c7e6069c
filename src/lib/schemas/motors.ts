import { z } from "zod";
import { MAX_AIR_TEMP_C, MAX_ELEVATION_M, MIN_AIR_TEMP_C, MIN_ELEVATION_M } from "../domain/atmosphere.ts";
import { MAX_CYLINDERS } from "../domain/compression.ts";
import { numberFromText } from "./number-text.ts";

// Motors, usage and readings: one schema per request body or query, shared by the API routes
// and the forms. Values on the wire are SI-style (mm, cc, kPa, m, °C) and usage is in the
// organisation's unit; forms convert before sending. Limits are named so forms can show them.

export const ENGINE_STATUSES = ["running", "bench", "spare", "retired"] as const;
export const ENGINE_CYCLES = ["two_stroke", "four_stroke"] as const;
export const CHASSIS_KINDS = ["sled", "bike", "kart", "atv", "utv", "car", "other"] as const;
export const METER_KINDS = ["hours", "km", "none"] as const;
export const PART_KINDS = ["piston", "rings", "crank", "rod", "cylinder", "head", "insert", "other"] as const;
export const PART_EVENT_KINDS = ["cut", "oversize"] as const;
export const USAGE_SOURCES = ["manual", "meter", "import"] as const;
export const SERVICE_KINDS = ["top_end", "bottom_end", "inspection"] as const;
export const SET_KINDS = ["teardown", "between_events", "build"] as const;
export const DATE_FORMATS = ["iso", "mdy", "dmy"] as const;

export const NAME_MAX = 60;
export const SERIAL_MAX = 80;
export const NOTES_MAX = 4000;
export const SHORT_NOTE_MAX = 500;
export const SESSION_LABEL_MAX = 80;
export const EVENT_LABEL_MAX = 120;
export const CHASSIS_NUMBER_MAX = 20;
export const CLASS_NAME_MAX = 80;
export const SEARCH_MAX = 80;
export const BORE_MM_MAX = 250;
export const STROKE_MM_MAX = 250;
export const ROD_MM_MAX = 600;
export const TARGET_RATIO_MAX = 30;
export const SQUISH_MM_MAX = 10;
export const OCTANE_MIN = 60;
export const OCTANE_MAX = 130;
export const LIMIT_MAX = 100_000;
export const PLAN_FRACTION_MIN = 0.5;
export const PLAN_FRACTION_MAX = 1;
export const USAGE_AMOUNT_MAX = 10_000;
export const METER_MAX = 9_999_999;
export const CHAMBER_CC_MAX = 2000;
export const CHAMBER_READINGS_MAX = 10;
export const CRANKING_KPA_MAX = 5000;
export const MACHINING_MM_MAX = 10;
export const DISPLACEMENT_CC_MAX = 20_000;
export const PAGE_SIZE_DEFAULT = 50;
export const PAGE_SIZE_MAX = 200;
export const TIMELINE_LIMIT_MAX = 500;
export const IMPORT_ROWS_MAX = 5000;
export const IMPORT_CSV_CHARS_MAX = 1_500_000;
export const UPLOAD_BYTES_MAX = 15 * 1024 * 1024;
export const UPLOAD_TYPES = ["image/jpeg", "image/png", "image/webp", "application/pdf"] as const;
export const CAPTION_MAX = 200;

// ---- field builders -------------------------------------------------------------------------

const num = (): z.ZodNumber => z.number({ error: "Enter a number." });
const range = (min: number, max: number, unit = ""): z.ZodNumber =>
  num().min(min, `Enter at least ${min}${unit}.`).max(max, `Enter at most ${max}${unit}.`);
const positive = (max: number, unit = ""): z.ZodNumber =>
  num().gt(0, "Enter a value greater than zero.").max(max, `Enter at most ${max}${unit}.`);
const text = (max: number): z.ZodString => z.string().trim().max(max, `Use at most ${max} characters.`);
/** Optional text: "" and null both mean "none". */
const optionalText = (max: number) =>
  z
    .union([text(max), z.null()])
    .transform((v) => (v === "" || v === null ? null : v))
    .optional();
const id = (): z.ZodNumber => z.number({ error: "Choose one." }).int().positive();
export const dateField = z.iso.date({ error: "Enter a date as YYYY-MM-DD." });
/** An ISO date-time with offset, or a plain date (taken as midnight UTC). */
export const instantField = z.union([z.iso.datetime({ offset: true }), z.iso.date()], {
  error: "Enter a date (YYYY-MM-DD) or a date and time.",
});
const elevation = (): z.ZodNumber => range(MIN_ELEVATION_M, MAX_ELEVATION_M, " m").int("Enter whole metres.");

// Query strings arrive as text; "" means absent.
const blankToUndefined = (v: unknown): unknown => (v === "" ? undefined : v);
const qInt = (min: number, max: number) =>
  z.preprocess(blankToUndefined, numberFromText(z.number().int(`Enter a whole number from ${min} to ${max}.`).min(min).max(max), `Enter a whole number from ${min} to ${max}.`).optional());
const qId = () => z.preprocess(blankToUndefined, numberFromText(z.number().int("Enter an id.").positive("Enter an id."), "Enter an id.").optional());
const qBool = () => z.preprocess(blankToUndefined, z.enum(["true", "false", "1", "0"]).optional()).transform((v) => v === "true" || v === "1");
const qDate = () => z.preprocess(blankToUndefined, dateField.optional());
const qText = (max: number) => z.preprocess(blankToUndefined, z.string().trim().max(max).optional());

export const pageQuery = {
  page: qInt(1, 100_000),
  perPage: qInt(1, PAGE_SIZE_MAX),
};

// ---- racing classes -------------------------------------------------------------------------

const racingClassFields = {
  name: text(CLASS_NAME_MAX).min(1, "Name the class."),
  minSquishMm: positive(SQUISH_MM_MAX, " mm").nullable().optional(),
  minChamberCc: positive(CHAMBER_CC_MAX, " cc").nullable().optional(),
  minFlatPlateCc: positive(CHAMBER_CC_MAX, " cc").nullable().optional(),
  maxDisplacementCc: positive(DISPLACEMENT_CC_MAX, " cc").nullable().optional(),
  squishWireNote: optionalText(200),
  notes: optionalText(NOTES_MAX),
};
export const racingClassCreateSchema = z.strictObject(racingClassFields);
export const racingClassUpdateSchema = z.strictObject({
  ...racingClassFields,
  name: racingClassFields.name.optional(),
  archived: z.boolean().optional(),
});
export type RacingClassCreate = z.infer<typeof racingClassCreateSchema>;
export type RacingClassUpdate = z.infer<typeof racingClassUpdateSchema>;

// ---- engines --------------------------------------------------------------------------------

const engineFields = {
  name: text(NAME_MAX).min(1, "Name the engine."),
  serial: optionalText(SERIAL_MAX),
  cycle: z.enum(ENGINE_CYCLES, { error: "Choose two-stroke or four-stroke." }).optional(),
  cylinders: num().int("Enter a whole number.").min(1, "At least one cylinder.").max(MAX_CYLINDERS, `At most ${MAX_CYLINDERS} cylinders.`),
  boreMm: positive(BORE_MM_MAX, " mm"),
  strokeMm: positive(STROKE_MM_MAX, " mm"),
  rodMm: positive(ROD_MM_MAX, " mm").nullable().optional(),
  exhaustOpensDegAtdc: range(0, 180, "°").nullable().optional(),
  targetRatio: num().gt(1, "A compression ratio is greater than 1.").max(TARGET_RATIO_MAX).nullable().optional(),
  targetSquishMm: positive(SQUISH_MM_MAX, " mm").nullable().optional(),
  buildFuelNote: optionalText(200),
  buildMinOctane: range(OCTANE_MIN, OCTANE_MAX).nullable().optional(),
  builtForMinElevationM: elevation().nullable().optional(),
  builtForMaxElevationM: elevation().nullable().optional(),
  racingClassId: id().nullable().optional(),
  status: z.enum(ENGINE_STATUSES, { error: "Choose running, bench, spare or retired." }).optional(),
  notes: optionalText(NOTES_MAX),
  topEndLimit: positive(LIMIT_MAX).nullable().optional(),
  bottomEndLimit: positive(LIMIT_MAX).nullable().optional(),
  inspectionInterval: positive(LIMIT_MAX).nullable().optional(),
  planFraction: range(PLAN_FRACTION_MIN, PLAN_FRACTION_MAX).optional(),
};

interface EngineCrossFields {
  cycle?: (typeof ENGINE_CYCLES)[number];
  strokeMm?: number;
  rodMm?: number | null;
  exhaustOpensDegAtdc?: number | null;
  builtForMinElevationM?: number | null;
  builtForMaxElevationM?: number | null;
}

/** The checks between fields, shared by create and by update (after merging with the stored engine). */
export function findEngineCrossFieldErrors(e: EngineCrossFields): Record<string, string> {
  const errors: Record<string, string> = {};
  if (e.rodMm != null && e.strokeMm != null && e.rodMm <= e.strokeMm / 2) errors.rodMm = "The rod must be longer than half the stroke.";
  if (e.exhaustOpensDegAtdc != null) {
    if (e.cycle === "four_stroke") errors.exhaustOpensDegAtdc = "Exhaust port timing applies to two-strokes only.";
    else if (e.rodMm == null) errors.rodMm = "Enter the rod length to place the exhaust port from its timing.";
  }
  if (e.builtForMinElevationM != null && e.builtForMaxElevationM != null && e.builtForMinElevationM > e.builtForMaxElevationM) {
    errors.builtForMaxElevationM = "The highest elevation must not be below the lowest.";
  }
  return errors;
}

function refineCross(value: EngineCrossFields, ctx: z.RefinementCtx): void {
  for (const [path, message] of Object.entries(findEngineCrossFieldErrors(value))) ctx.addIssue({ code: "custom", path: [path], message });
}

export const engineCreateSchema = z.strictObject(engineFields).superRefine(refineCross);
export const engineUpdateSchema = z.strictObject({
  ...engineFields,
  name: engineFields.name.optional(),
  cylinders: engineFields.cylinders.optional(),
  boreMm: engineFields.boreMm.optional(),
  strokeMm: engineFields.strokeMm.optional(),
  archived: z.boolean().optional(),
});
export type EngineCreate = z.infer<typeof engineCreateSchema>;
export type EngineUpdate = z.infer<typeof engineUpdateSchema>;

export const ROSTER_SORTS = [
  "name",
  "status",
  "chassis",
  "sinceNew",
  "sinceTopEnd",
  "sinceBottomEnd",
  "topEndShare",
  "bottomEndShare",
  "updatedAt",
] as const;
export type RosterSortKey = (typeof ROSTER_SORTS)[number];
const sortValues = ROSTER_SORTS.flatMap((s) => [s, `-${s}`]) as [string, ...string[]];

export const engineListQuerySchema = z.object({
  ...pageQuery,
  status: z
    .preprocess(blankToUndefined, z.string().optional())
    .transform((v, ctx) => {
      if (v === undefined) return undefined;
      const list = v.split(",").map((s) => s.trim()).filter(Boolean);
      const bad = list.filter((s) => !(ENGINE_STATUSES as readonly string[]).includes(s));
      if (bad.length) ctx.addIssue({ code: "custom", message: `Unknown status: ${bad.join(", ")}.` });
      return list as (typeof ENGINE_STATUSES)[number][];
    }),
  chassisId: z.preprocess(blankToUndefined, z.union([z.literal("none"), numberFromText(z.number().int().positive(), "Enter a chassis id or none.")]).optional()),
  racingClassId: qId(),
  search: qText(SEARCH_MAX),
  sort: z.preprocess(blankToUndefined, z.enum(sortValues, { error: `Sort by one of: ${ROSTER_SORTS.join(", ")} (prefix - for descending).` }).optional()),
  includeArchived: qBool(),
});
export type EngineListQuery = z.infer<typeof engineListQuerySchema>;

export const timelineQuerySchema = z.object({
  page: qInt(1, 100_000),
  limit: qInt(1, TIMELINE_LIMIT_MAX),
});

export const serviceRecordSchema = z.strictObject({
  kind: z.enum(SERVICE_KINDS, { error: "Choose top end, bottom end or inspection." }),
  doneOn: dateField,
  notes: optionalText(NOTES_MAX),
});
export type ServiceRecordInput = z.infer<typeof serviceRecordSchema>;

// ---- chassis and installations ----------------------------------------------------------------

const chassisFields = {
  number: text(CHASSIS_NUMBER_MAX).min(1, "Enter the chassis number."),
  kind: z.enum(CHASSIS_KINDS, { error: `Choose one of: ${CHASSIS_KINDS.join(", ")}.` }),
  meterKind: z.enum(METER_KINDS, { error: "Choose hours, km or none." }).optional(),
  notes: optionalText(NOTES_MAX),
};
export const chassisCreateSchema = z.strictObject(chassisFields);
export const chassisUpdateSchema = z.strictObject({
  number: chassisFields.number.optional(),
  kind: chassisFields.kind.optional(),
  meterKind: chassisFields.meterKind,
  notes: chassisFields.notes,
  archived: z.boolean().optional(),
});
export type ChassisCreate = z.infer<typeof chassisCreateSchema>;
export type ChassisUpdate = z.infer<typeof chassisUpdateSchema>;

export const chassisListQuerySchema = z.object({
  search: qText(SEARCH_MAX),
  includeArchived: qBool(),
});

const meter = (): z.ZodNumber => range(0, METER_MAX);
export const installSchema = z.strictObject({
  engineId: id(),
  installedAt: instantField.optional(),
  meterAtInstall: meter().nullable().optional(),
  notes: optionalText(SHORT_NOTE_MAX),
});
export const removeSchema = z.strictObject({
  removedAt: instantField.optional(),
  meterAtRemoval: meter().nullable().optional(),
  /** The engine's status once out (default: on the bench). */
  status: z.enum(["bench", "spare", "retired"], { error: "Choose bench, spare or retired." }).optional(),
  notes: optionalText(SHORT_NOTE_MAX),
});
export type InstallInput = z.infer<typeof installSchema>;
export type RemoveInput = z.infer<typeof removeSchema>;

// ---- parts ------------------------------------------------------------------------------------

const cylinderNo = (): z.ZodNumber => num().int().min(1, "Cylinders count from 1.").max(MAX_CYLINDERS);
const partFields = {
  serial: text(SERIAL_MAX).min(1, "Enter the serial."),
  kind: z.enum(PART_KINDS, { error: `Choose one of: ${PART_KINDS.join(", ")}.` }),
  description: optionalText(200),
  usageLimit: positive(LIMIT_MAX).nullable().optional(),
  initialUsage: range(0, LIMIT_MAX).optional(),
  maxTotalCutMm: positive(MACHINING_MM_MAX, " mm").nullable().optional(),
  maxOversizeMm: positive(MACHINING_MM_MAX, " mm").nullable().optional(),
  notes: optionalText(NOTES_MAX),
};
export const partCreateSchema = z.strictObject({
  ...partFields,
  engineId: id().nullable().optional(),
  cylinderNo: cylinderNo().nullable().optional(),
  installedOn: dateField.optional(),
});
export const partUpdateSchema = z.strictObject({
  serial: partFields.serial.optional(),
  description: partFields.description,
  usageLimit: partFields.usageLimit,
  maxTotalCutMm: partFields.maxTotalCutMm,
  maxOversizeMm: partFields.maxOversizeMm,
  notes: partFields.notes,
  archived: z.boolean().optional(),
});
export const partMoveSchema = z.strictObject({
  toEngineId: id().nullable(),
  cylinderNo: cylinderNo().nullable().optional(),
  movedOn: dateField,
  notes: optionalText(SHORT_NOTE_MAX),
});
export const partEventSchema = z.strictObject({
  kind: z.enum(PART_EVENT_KINDS, { error: "Choose cut or oversize." }),
  amountMm: positive(MACHINING_MM_MAX, " mm"),
  doneOn: dateField,
  notes: optionalText(SHORT_NOTE_MAX),
});
export const partListQuerySchema = z.object({
  ...pageQuery,
  engineId: qId(),
  kind: z.preprocess(blankToUndefined, z.enum(PART_KINDS).optional()),
  onShelf: qBool(),
  search: qText(SEARCH_MAX),
  includeArchived: qBool(),
});
export type PartCreate = z.infer<typeof partCreateSchema>;
export type PartUpdate = z.infer<typeof partUpdateSchema>;
export type PartMoveInput = z.infer<typeof partMoveSchema>;
export type PartEventInput = z.infer<typeof partEventSchema>;
export type PartListQuery = z.infer<typeof partListQuerySchema>;

// ---- usage ------------------------------------------------------------------------------------

export const usageLogSchema = z
  .strictObject({
    engineId: id(),
    occurredOn: dateField,
    amount: range(0, USAGE_AMOUNT_MAX).optional(),
    meterReading: meter().optional(),
    sessionLabel: optionalText(SESSION_LABEL_MAX),
    eventLabel: optionalText(EVENT_LABEL_MAX),
    notes: optionalText(SHORT_NOTE_MAX),
  })
  .superRefine((v, ctx) => {
    if ((v.amount === undefined) === (v.meterReading === undefined)) {
      ctx.addIssue({ code: "custom", path: ["amount"], message: "Enter either the usage or the meter reading." });
    }
  });
export type UsageLogInput = z.infer<typeof usageLogSchema>;

export const usageListQuerySchema = z.object({
  ...pageQuery,
  engineId: qId(),
  from: qDate(),
  to: qDate(),
  source: z.preprocess(blankToUndefined, z.enum(USAGE_SOURCES).optional()),
  includeArchived: qBool(),
});
export type UsageListQuery = z.infer<typeof usageListQuerySchema>;

const columnName = z.string().trim().min(1).max(100);
export const usageImportSchema = z.strictObject({
  csv: z.string().min(1, "The file is empty.").max(IMPORT_CSV_CHARS_MAX, "Split files larger than 1.5 MB into parts."),
  mapping: z
    .strictObject({
      engine: columnName,
      date: columnName,
      amount: columnName,
      session: columnName.nullable().optional(),
      event: columnName.nullable().optional(),
      notes: columnName.nullable().optional(),
    })
    .optional(),
  dateFormat: z.enum(DATE_FORMATS).optional(),
  skipBadRows: z.boolean().optional(),
});
export type UsageImportInput = z.infer<typeof usageImportSchema>;

// ---- readings ---------------------------------------------------------------------------------

export const cylinderReadingSchema = z
  .strictObject({
    cylinderNo: cylinderNo(),
    chamberReadingsCc: z.array(positive(CHAMBER_CC_MAX, " cc")).max(CHAMBER_READINGS_MAX, `At most ${CHAMBER_READINGS_MAX} readings.`).optional(),
    flatPlateCc: positive(CHAMBER_CC_MAX, " cc").nullable().optional(),
    squishAMm: positive(SQUISH_MM_MAX, " mm").nullable().optional(),
    squishBMm: positive(SQUISH_MM_MAX, " mm").nullable().optional(),
    crankingKpa: range(0, CRANKING_KPA_MAX, " kPa").nullable().optional(),
    leakdownPct: range(0, 100, " %").nullable().optional(),
    notes: optionalText(SHORT_NOTE_MAX),
  })
  .superRefine((c, ctx) => {
    if ((c.squishAMm == null) !== (c.squishBMm == null)) {
      ctx.addIssue({ code: "custom", path: [c.squishAMm == null ? "squishAMm" : "squishBMm"], message: "Read squish on both sides of the pin axis." });
    }
    const measured =
      (c.chamberReadingsCc?.length ?? 0) > 0 || c.flatPlateCc != null || c.squishAMm != null || c.crankingKpa != null || c.leakdownPct != null;
    if (!measured) ctx.addIssue({ code: "custom", path: ["cylinderNo"], message: "Enter at least one reading for this cylinder." });
  });
export type CylinderReadingInput = z.infer<typeof cylinderReadingSchema>;

export const readingSetCreateSchema = z
  .strictObject({
    engineId: id(),
    takenOn: dateField,
    elevationM: elevation().optional(),
    airTempC: range(MIN_AIR_TEMP_C, MAX_AIR_TEMP_C, " °C").nullable().optional(),
    methodNotes: optionalText(NOTES_MAX),
    setKind: z.enum(SET_KINDS, { error: "Choose teardown, between events or build." }),
    isBaseline: z.boolean().optional(),
    cylinders: z.array(cylinderReadingSchema).min(1, "Enter at least one cylinder.").max(MAX_CYLINDERS),
    uploadIds: z.array(id()).max(50).optional(),
  })
  .superRefine((s, ctx) => {
    const seen = new Set<number>();
    s.cylinders.forEach((c, i) => {
      if (seen.has(c.cylinderNo)) ctx.addIssue({ code: "custom", path: ["cylinders", i, "cylinderNo"], message: "This cylinder is entered twice." });
      seen.add(c.cylinderNo);
    });
  });
export type ReadingSetCreate = z.infer<typeof readingSetCreateSchema>;

/** The same body without the engine's identity check, for live figures while typing. */
export const readingSetPreviewSchema = readingSetCreateSchema;

export const baselineSchema = z.strictObject({ isBaseline: z.boolean({ error: "Say true or false." }) });

export const readingSetListQuerySchema = z.object({
  ...pageQuery,
  engineId: qId(),
  from: qDate(),
  to: qDate(),
  baselineOnly: qBool(),
  includeArchived: qBool(),
});
export type ReadingSetListQuery = z.infer<typeof readingSetListQuerySchema>;

// ---- uploads and exports ------------------------------------------------------------------------

/** The text fields of the multipart upload form. */
export const uploadFieldsSchema = z
  .strictObject({
    engineId: z.preprocess(blankToUndefined, numberFromText(z.number().int().positive(), "Choose an engine.").optional()),
    readingSetId: z.preprocess(blankToUndefined, numberFromText(z.number().int().positive(), "Choose a reading set.").optional()),
    cylinderNo: z.preprocess(
      blankToUndefined,
      numberFromText(z.number().int().min(1).max(MAX_CYLINDERS), `Enter a cylinder from 1 to ${MAX_CYLINDERS}.`).optional(),
    ),
    caption: z.preprocess(blankToUndefined, text(CAPTION_MAX).optional()),
  })
  .superRefine((v, ctx) => {
    if (v.engineId === undefined && v.readingSetId === undefined) {
      ctx.addIssue({ code: "custom", path: ["engineId"], message: "Attach the file to an engine or a reading set." });
    }
  });
export type UploadFields = z.infer<typeof uploadFieldsSchema>;

export const uploadListQuerySchema = z.object({
  engineId: qId(),
  readingSetId: qId(),
  includeArchived: qBool(),
});

export const uploadReadQuerySchema = z.object({
  variant: z.preprocess(blankToUndefined, z.enum(["original", "thumbnail"]).optional()),
  download: qBool(),
});

export const exportQuerySchema = z.object({
  engineId: qId(),
  from: qDate(),
  to: qDate(),
  includeArchived: qBool(),
});
export type ExportQuery = z.infer<typeof exportQuerySchema>;
