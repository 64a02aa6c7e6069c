import { json, defineApi } from "../../../../server/http.ts";
import { engineCreateSchema, engineListQuerySchema } from "../../../../lib/schemas/motors.ts";
import { createEngine } from "../../../../server/services/engines-service.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { listRoster } from "../../../../server/services/roster-service.ts";

export const GET = defineApi({
  permission: "engine:read",
  input: engineListQuerySchema,
  handler: async ({ input, membership }) => listRoster(membership.organisationId, membership.usageUnit, input),
});

export const POST = defineApi({
  permission: "engine:update",
  input: engineCreateSchema,
  handler: async (args) => json({ engine: await createEngine(actorFrom(args), args.input) }, 201),
});
