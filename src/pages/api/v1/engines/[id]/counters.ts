import { defineApi } from "../../../../../server/http.ts";
import { describeCounters, NO_ENGINE } from "../../../../../server/services/engines-service.ts";
import { idParam } from "../../../../../server/route-params.ts";

export const GET = defineApi({
  permission: "engine:read",
  handler: async ({ context, membership }) => describeCounters(membership.organisationId, idParam(context.params, "id", NO_ENGINE)),
});
