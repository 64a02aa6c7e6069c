import { defineApi, json } from "../../../server/http.ts";
import { closedDayQuery, closedDaySchema, shopSettingsSchema } from "../../../lib/schemas/season.ts";
import { actorFrom } from "../../../server/services/motors-common.ts";
import { addClosedDay, getShop, removeClosedDay, updateShop } from "../../../server/services/season-service.ts";

/** The shop's hours per weekday, job lengths, parts lead time and closed days. */
export const GET = defineApi({
  permission: "season:read",
  handler: async ({ membership }) => getShop(membership.organisationId, new Date()),
});

export const PATCH = defineApi({
  permission: "season:plan",
  input: shopSettingsSchema,
  handler: async (args) => updateShop(actorFrom(args), args.input),
});

/** Closes a day ({"day": "2026-12-24", "reason": "…"}). */
export const POST = defineApi({
  permission: "season:plan",
  input: closedDaySchema,
  handler: async (args) => json(await addClosedDay(actorFrom(args), args.input.day, args.input.reason), 201),
});

/** Opens a closed day again (?day=2026-12-24). */
export const DELETE = defineApi({
  permission: "season:plan",
  input: closedDayQuery,
  handler: async (args) => removeClosedDay(actorFrom(args), args.input.day),
});
