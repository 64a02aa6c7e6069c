import { z } from "zod";
import { defineApi, json } from "../../../../../../server/http.ts";
import { serviceRecordSchema } from "../../../../../../lib/schemas/motors.ts";
import { listEngineServices, NO_ENGINE, recordService } from "../../../../../../server/services/engines-service.ts";
import { actorFrom } from "../../../../../../server/services/motors-common.ts";
import { idParam } from "../../../../../../server/route-params.ts";

const listQuery = z.object({ includeArchived: z.enum(["true", "false"]).optional() });

export const GET = defineApi({
  permission: "engine:read",
  input: listQuery,
  handler: async ({ input, context, membership }) => ({
    services: await listEngineServices(membership.organisationId, idParam(context.params, "id", NO_ENGINE), input.includeArchived === "true"),
  }),
});

export const POST = defineApi({
  permission: "job:work",
  input: serviceRecordSchema,
  handler: async (args) => json({ service: await recordService(actorFrom(args), idParam(args.context.params, "id", NO_ENGINE), args.input) }, 201),
});
