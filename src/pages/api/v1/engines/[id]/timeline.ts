import { defineApi } from "../../../../../server/http.ts";
import { timelineQuerySchema } from "../../../../../lib/schemas/motors.ts";
import { getEngineTimeline } from "../../../../../server/services/engine-timeline-service.ts";
import { NO_ENGINE } from "../../../../../server/services/engines-service.ts";
import { idParam } from "../../../../../server/route-params.ts";

export const GET = defineApi({
  permission: "engine:read",
  input: timelineQuerySchema,
  handler: async ({ input, context, membership }) => getEngineTimeline(membership.organisationId, idParam(context.params, "id", NO_ENGINE), input),
});
