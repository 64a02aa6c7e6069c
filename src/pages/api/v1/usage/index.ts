import { defineApi, json } from "../../../../server/http.ts";
import { usageListQuerySchema, usageLogSchema } from "../../../../lib/schemas/motors.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { listUsage, logUsage } from "../../../../server/services/usage-service.ts";

export const GET = defineApi({
  permission: "engine:read",
  input: usageListQuerySchema,
  handler: async ({ input, membership }) => listUsage(membership.organisationId, input),
});

export const POST = defineApi({
  permission: "usage:log",
  input: usageLogSchema,
  handler: async (args) => json({ entry: await logUsage(actorFrom(args), args.input) }, 201),
});
