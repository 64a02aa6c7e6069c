import { defineApi, json } from "../../../../server/http.ts";
import { chassisCreateSchema, chassisListQuerySchema } from "../../../../lib/schemas/motors.ts";
import { createChassis, listChassis } from "../../../../server/services/chassis-service.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";

export const GET = defineApi({
  permission: "engine:read",
  input: chassisListQuerySchema,
  handler: async ({ input, membership }) => ({ chassis: await listChassis(membership.organisationId, input) }),
});

export const POST = defineApi({
  permission: "chassis:update",
  input: chassisCreateSchema,
  handler: async (args) => json({ chassis: await createChassis(actorFrom(args), args.input) }, 201),
});
