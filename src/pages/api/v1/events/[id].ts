import { defineApi } from "../../../../server/http.ts";
import { eventUpdateSchema } from "../../../../lib/schemas/season.ts";
import { idParam } from "../../../../server/route-params.ts";
import { getEventDetail } from "../../../../server/services/event-fuel-service.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { archiveEvent, NO_EVENT, updateEvent } from "../../../../server/services/season-service.ts";

/** The event with its entries, each engine's life left after it, and the fuel check per engine. */
export const GET = defineApi({
  permission: "season:read",
  handler: async ({ context, membership }) => getEventDetail(membership.organisationId, idParam(context.params, "id", NO_EVENT)),
});

export const PATCH = defineApi({
  permission: "season:plan",
  input: eventUpdateSchema,
  handler: async (args) => ({ event: await updateEvent(actorFrom(args), idParam(args.context.params, "id", NO_EVENT), args.input) }),
});

/** Events are archived, never deleted. */
export const DELETE = defineApi({
  permission: "season:plan",
  handler: async (args) => ({ event: await archiveEvent(actorFrom(args), idParam(args.context.params, "id", NO_EVENT)) }),
});
