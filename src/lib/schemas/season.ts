import { z } from "zod";
import { numberFromText } from "./number-text.ts";

export const EVENT_NAME_MAX = 120;
export const USAGE_PER_ENTRY_MAX = 1000;
/** A calendar day; 2027-02-30 is refused (Date.parse would roll it over into March). */
export const day = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date like 2027-02-14.")
  .refine((s) => {
    const t = Date.parse(`${s}T00:00:00Z`);
    return !Number.isNaN(t) && new Date(t).toISOString().slice(0, 10) === s;
  }, "Not a real date.");

const eventFields = z.strictObject({
  name: z.string().trim().min(1, "Name the event.").max(EVENT_NAME_MAX),
  venue: z.string().trim().max(120).nullable().optional(),
  startsOn: day,
  endsOn: day,
  elevationM: z.number({ error: "Elevation above sea level in metres." }).min(-500, "Between −500 and 9,000 m.").max(9000, "Between −500 and 9,000 m."),
  expectedAirTempC: z.number().min(-60).max(55).nullable().optional(),
  kind: z.enum(["practice", "race", "test"], { error: "Choose practice, race or test." }),
  important: z.boolean().optional(),
  notes: z.string().max(2000).nullable().optional(),
  entries: z
    .array(
      z.strictObject({
        chassisId: z.number().int().positive(),
        expectedUsage: z.number().gt(0, "Expected usage must be more than zero.").max(USAGE_PER_ENTRY_MAX),
      }),
    )
    .max(500)
    .optional(),
});

/** An event (a race weekend, a test day, a week of practice) lasts at most this many days. */
export const EVENT_DAYS_MAX = 31;

export function checkEventDates(startsOn: string, endsOn: string): string | null {
  if (endsOn < startsOn) return "The event cannot end before it starts.";
  if ((Date.parse(`${endsOn}T00:00:00Z`) - Date.parse(`${startsOn}T00:00:00Z`)) / 86_400_000 >= EVENT_DAYS_MAX) return `An event lasts at most ${EVENT_DAYS_MAX} days.`;
  return null;
}

function endsAfterStart<T extends { startsOn?: string; endsOn?: string }>(v: T, ctx: z.RefinementCtx): void {
  const problem = v.startsOn && v.endsOn ? checkEventDates(v.startsOn, v.endsOn) : null;
  if (problem) ctx.addIssue({ code: "custom", path: ["endsOn"], message: problem });
}

export const eventCreateSchema = eventFields.superRefine(endsAfterStart);
export const eventUpdateSchema = eventFields.partial().superRefine(endsAfterStart);

export const shopSettingsSchema = z.strictObject({
  hoursPerWeekday: z.array(z.number().min(0, "No negative hours.").max(24, "At most 24 hours a day.")).length(7, "Seven days, Monday first."),
  travelDaysBeforeEvent: z.number().int().min(0).max(7),
  topEndHours: z.number().gt(0).max(200),
  bottomEndHours: z.number().gt(0).max(400),
  inspectionHours: z.number().gt(0).max(100),
  partsLeadDays: z.number().int().min(0).max(120),
});

export const closedDaySchema = z.strictObject({ day, reason: z.string().trim().max(120).optional() });

export const entryPinSchema = z.strictObject({ engineId: z.number().int().positive().nullable() });

export const jobMoveSchema = z.strictObject({ startsOn: day });

export const jobCreateSchema = z.strictObject({
  engineId: z.number().int().positive(),
  kind: z.enum(["top_end", "bottom_end", "inspection"]),
  startsOn: day,
  pinned: z.boolean().optional(),
});

export const jobUpdateSchema = z.strictObject({
  state: z.enum(["planned", "in_progress", "done", "cancelled"]).optional(),
  checklist: z.array(z.strictObject({ item: z.string().min(1).max(200), done: z.boolean() })).max(60).optional(),
  labourHoursActual: z.number().min(0).max(500).nullable().optional(),
  assignedTo: z.string().max(40).nullable().optional(),
  notes: z.string().max(4000).nullable().optional(),
  doneOn: day.optional(),
  parts: z.array(z.strictObject({ partId: z.number().int().positive().nullable().optional(), description: z.string().trim().min(1).max(200), quantity: z.number().int().min(1).max(100) })).max(50).optional(),
});

export const fuelDecisionSchema = z.strictObject({ fuelRun: z.string().trim().min(1, "Write the fuel that was run.").max(200, "At most 200 characters.") });

/** POST /plan: {accept:false} previews; {accept:true, basis} applies the plan the preview showed. */
export const replanSchema = z.strictObject({ accept: z.boolean().optional(), basis: z.string().max(64).optional() });

export const eventListQuery = z.object({ from: day.optional(), to: day.optional(), includeArchived: z.enum(["true", "false"]).optional() });

export const jobListQuery = z.object({
  state: z.enum(["planned", "in_progress", "done", "cancelled"]).optional(),
  engineId: numberFromText(z.number().int().positive(), "Enter an engine id.").optional(),
  from: day.optional(),
  to: day.optional(),
});

export const closedDayQuery = z.object({ day });


