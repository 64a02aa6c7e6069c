import { defineApi } from "../../../../server/http.ts";
import { signalListQuerySchema } from "../../../../lib/schemas/signals.ts";
import { listSignals } from "../../../../server/services/signals-service.ts";

export const GET = defineApi({
  permission: "signal:read",
  input: signalListQuerySchema,
  handler: async ({ input, membership }) => listSignals(membership.organisationId, input),
});
