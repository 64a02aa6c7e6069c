import { defineApi } from "../../../../server/http.ts";
import { signalCountsQuerySchema } from "../../../../lib/schemas/motors-ui.ts";
import { countOpenSignals } from "../../../../server/services/motors-ui-signals-service.ts";

/** Open and acknowledged signals per engine, by level: { counts: { "<engineId>": { watch, act } } }. */
export const GET = defineApi({
  permission: "signal:read",
  input: signalCountsQuerySchema,
  handler: async ({ input, membership }) => ({ counts: await countOpenSignals(membership.organisationId, input.engineIds) }),
});
