import { z } from "zod";

export const ORG_NAME_MAX = 120;
export const FUEL_ROWS_MAX = 12;

const NUMBER_TEXT = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

/**
 * What a settings form field holds, as the JSON the schemas take: its number when the text is
 * one, else the text itself (which the schema then refuses by name). The schemas never coerce, so
 * true, [7] or "" in a JSON body are refused rather than read as 1, 7 or 0.
 */
export function numberFromFormText(text: string | undefined): number | string | undefined {
  const t = text?.trim();
  return t !== undefined && NUMBER_TEXT.test(t) ? Number(t) : t;
}

function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat("en", { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

export const generalSettingsSchema = z.strictObject({
  name: z.string().trim().min(1, "Enter the organisation's name.").max(ORG_NAME_MAX),
  timeZone: z.string().trim().refine(isTimeZone, "Use a time zone name such as America/Denver or Europe/Oslo."),
  usageUnit: z.enum(["hours", "kilometres", "laps", "litres"], { error: "Choose hours, kilometres, laps or litres." }),
  unitSystem: z.enum(["metric", "imperial"], { error: "Choose metric or imperial." }),
  shopElevationM: z.number({ error: "Enter the elevation in metres." }).min(-500, "Between −500 and 9,000 m.").max(9000, "Between −500 and 9,000 m.").nullable(),
  chamberToleranceCc: z.number({ error: "Enter the tolerance in cc." }).min(0.05, "At least 0.05 cc.").max(2, "At most 2 cc."),
});

const positive = z.number({ error: "Enter a number." }).positive("Must be greater than zero.").max(100000);

export const thresholdsSchema = z.record(z.string(), z.record(z.string(), positive));

export const signalSettingsSchema = z.strictObject({
  schedule: z.string().trim().min(9).max(64),
  thresholds: thresholdsSchema.nullable(),
});

export const fuelRowSchema = z.strictObject({
  upToCrankingKpa: z.number({ error: "Enter a pressure." }).positive("Must be greater than zero.").max(5000, "At most 5,000 kPa."),
  grade: z.string().trim().min(1, "Write the fuel as the team calls it.").max(120),
  octaneAki: z.number({ error: "Enter an octane number." }).min(60).max(130).optional(),
});

export const fuelTableSchema = z.strictObject({
  label: z.string().trim().min(1).max(300),
  rows: z.array(fuelRowSchema).min(1, "Keep at least one row.").max(FUEL_ROWS_MAX),
});

export const settingsPatchSchema = z.strictObject({
  general: generalSettingsSchema.partial().optional(),
  signals: signalSettingsSchema.partial().optional(),
  fuelTable: fuelTableSchema.nullable().optional(),
});
