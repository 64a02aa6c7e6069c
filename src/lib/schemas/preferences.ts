import { z } from "zod";
import { UNIT_OPTIONS } from "../unit-preferences.ts";

const unitSystemField = z.enum(["metric", "imperial"], { error: "unitSystem must be metric, imperial or null" });

export const unitChoicesSchema = z.strictObject({
  length: z.enum(UNIT_OPTIONS.length, { error: "length must be mm or in" }).optional(),
  volume: z.enum(UNIT_OPTIONS.volume, { error: "volume must be cc or in3" }).optional(),
  pressure: z.enum(UNIT_OPTIONS.pressure, { error: "pressure must be kPa, bar or psi" }).optional(),
  elevation: z.enum(UNIT_OPTIONS.elevation, { error: "elevation must be m or ft" }).optional(),
  temperature: z.enum(UNIT_OPTIONS.temperature, { error: "temperature must be C or F" }).optional(),
});

/** PATCH /api/v1/me/preferences: send what changes; null returns a preference to the default. */
export const preferencesPatchSchema = z
  .strictObject({
    unitSystem: unitSystemField.nullable().optional(),
    unitChoices: unitChoicesSchema.nullable().optional(),
  })
  .refine((v) => v.unitSystem !== undefined || v.unitChoices !== undefined, {
    message: "send unitSystem, unitChoices or both",
    path: ["body"],
  });

export type PreferencesPatch = z.infer<typeof preferencesPatchSchema>;
