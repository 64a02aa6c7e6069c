import { defineApi, json } from "../../../../../server/http.ts";
import { partEventSchema } from "../../../../../lib/schemas/motors.ts";
import { actorFrom } from "../../../../../server/services/motors-common.ts";
import { getPart, recordPartEvent } from "../../../../../server/services/parts-service.ts";
import { idParam } from "../../../../../server/route-params.ts";

const NO_PART = "No part with that id in this organisation.";

export const GET = defineApi({
  permission: "engine:read",
  handler: async ({ context, membership }) => ({ events: (await getPart(membership.organisationId, idParam(context.params, "id", NO_PART))).events }),
});

/** Records a head/insert cut (adds to the total removed) or a rebore to a new oversize. */
export const POST = defineApi({
  permission: "part:update",
  input: partEventSchema,
  handler: async (args) => json(await recordPartEvent(actorFrom(args), idParam(args.context.params, "id", NO_PART), args.input), 201),
});
