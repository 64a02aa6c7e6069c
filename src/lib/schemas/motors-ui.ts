import { z } from "zod";

// Requests of the Motors pages' own routes: an engine's signal thresholds and the open-signal
// counts the roster shows. Shared by the routes and the islands.

export const THRESHOLD_VALUE_MAX = 1000;
export const SIGNAL_COUNT_IDS_MAX = 200;

const thresholdValue = z
  .number({ error: "Enter a number." })
  .gt(0, "Enter a value greater than zero.")
  .max(THRESHOLD_VALUE_MAX, `Enter at most ${THRESHOLD_VALUE_MAX}.`);

/** Groups of numeric thresholds; the domain's mergeThresholds names unknown groups and fields. */
export const engineThresholdsPatchSchema = z.strictObject({
  thresholds: z.union([z.record(z.string().min(1).max(40), z.record(z.string().min(1).max(40), thresholdValue)), z.null()], {
    error: "Send the thresholds as groups of numbers, or null to follow the organisation.",
  }),
});
export type EngineThresholdsPatch = z.infer<typeof engineThresholdsPatchSchema>;

export const signalCountsQuerySchema = z.object({
  engineIds: z
    .string()
    .trim()
    .max(SIGNAL_COUNT_IDS_MAX * 16)
    .optional()
    .transform((v, ctx) => {
      if (v === undefined || v === "") return undefined;
      const parts = v.split(",").map((s) => s.trim());
      if (parts.length > SIGNAL_COUNT_IDS_MAX || parts.some((p) => !/^[1-9]\d{0,14}$/.test(p))) {
        ctx.addIssue({ code: "custom", message: `List up to ${SIGNAL_COUNT_IDS_MAX} engine ids, separated by commas.` });
        return undefined;
      }
      return parts.map(Number);
    }),
});
