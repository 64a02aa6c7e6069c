import { defineApi } from "../../../../../server/http.ts";
import { engineThresholdsPatchSchema } from "../../../../../lib/schemas/motors-ui.ts";
import { actorFrom } from "../../../../../server/services/motors-common.ts";
import { loadEngineThresholds, saveEngineThresholds } from "../../../../../server/services/motors-ui-thresholds-service.ts";
import { idParam } from "../../../../../server/route-params.ts";

const NO_ENGINE = "No engine with that id in this organisation.";

/** The thresholds the signal check applies to this engine, the organisation's, and the engine's own. */
export const GET = defineApi({
  permission: "engine:read",
  handler: async ({ context, membership }) => loadEngineThresholds(membership.organisationId, idParam(context.params, "id", NO_ENGINE)),
});

/** {"thresholds": {group: {field: number}}} sets the engine's own values; {"thresholds": null} follows the organisation again. */
export const PATCH = defineApi({
  permission: "reading:baseline",
  input: engineThresholdsPatchSchema,
  handler: async (args) => saveEngineThresholds(actorFrom(args), idParam(args.context.params, "id", NO_ENGINE), args.input.thresholds),
});
