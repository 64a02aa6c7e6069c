import { z } from "zod";
import { numberFromText } from "./number-text.ts";

export const SIGNAL_KINDS = ["due-soon", "overdue", "drift", "spread", "squish-sides", "unconfirmed", "class-rule"] as const;
export const SIGNAL_STATES = ["open", "acknowledged", "resolved"] as const;
export const NOTE_MAX = 2000;

export const signalListQuerySchema = z.strictObject({
  kind: z.enum(SIGNAL_KINDS).optional(),
  severity: z.enum(["watch", "act"]).optional(),
  state: z.enum([...SIGNAL_STATES, "active", "all"]).optional(),
  engineId: numberFromText(z.number().int().positive(), "Enter an engine id.").optional(),
  page: numberFromText(z.number().int().min(1).max(10000), "Enter a page from 1 to 10000.").optional(),
  perPage: numberFromText(z.number().int().min(1).max(200), "Enter a page size from 1 to 200.").optional(),
});

export const signalActionSchema = z.discriminatedUnion("action", [
  z.strictObject({ action: z.literal("acknowledge") }),
  z.strictObject({
    action: z.literal("resolve"),
    note: z.string().trim().min(1, "Say what was done or found.").max(NOTE_MAX),
  }),
]);

export const TOPICS = ["drift", "due", "jobs"] as const;
export const MODES = ["immediate", "digest", "off"] as const;

export const preferencesSchema = z.strictObject({
  drift: z.enum(MODES).optional(),
  due: z.enum(MODES).optional(),
  jobs: z.enum(MODES).optional(),
});
