import { defineApi, json } from "../../../../server/http.ts";
import { partCreateSchema, partListQuerySchema } from "../../../../lib/schemas/motors.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { createPart, listParts } from "../../../../server/services/parts-service.ts";

export const GET = defineApi({
  permission: "engine:read",
  input: partListQuerySchema,
  handler: async ({ input, membership }) => listParts(membership.organisationId, input),
});

export const POST = defineApi({
  permission: "part:update",
  input: partCreateSchema,
  handler: async (args) => json({ part: await createPart(actorFrom(args), args.input) }, 201),
});
