import { defineApi } from "../../../../server/http.ts";
import { partUpdateSchema } from "../../../../lib/schemas/motors.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { getPart, updatePart } from "../../../../server/services/parts-service.ts";
import { idParam } from "../../../../server/route-params.ts";

const NO_PART = "No part with that id in this organisation.";

export const GET = defineApi({
  permission: "engine:read",
  handler: async ({ context, membership }) => getPart(membership.organisationId, idParam(context.params, "id", NO_PART)),
});

export const PATCH = defineApi({
  permission: "part:update",
  input: partUpdateSchema,
  handler: async (args) => ({ part: await updatePart(actorFrom(args), idParam(args.context.params, "id", NO_PART), args.input) }),
});

/** Parts keep their history: DELETE archives a part that sits on the shelf. */
export const DELETE = defineApi({
  permission: "part:update",
  handler: async (args) => ({ part: await updatePart(actorFrom(args), idParam(args.context.params, "id", NO_PART), { archived: true }) }),
});
