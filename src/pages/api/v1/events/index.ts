import { defineApi, json } from "../../../../server/http.ts";
import { eventCreateSchema, eventListQuery } from "../../../../lib/schemas/season.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { createEvent, listEvents } from "../../../../server/services/season-service.ts";

export const GET = defineApi({
  permission: "season:read",
  input: eventListQuery,
  handler: async ({ input, membership }) => ({
    events: await listEvents(membership.organisationId, { from: input.from, to: input.to, includeArchived: input.includeArchived === "true" }),
  }),
});

export const POST = defineApi({
  permission: "season:plan",
  input: eventCreateSchema,
  handler: async (args) => json({ event: await createEvent(actorFrom(args), args.input) }, 201),
});
