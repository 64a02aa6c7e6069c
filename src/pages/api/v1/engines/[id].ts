import { defineApi } from "../../../../server/http.ts";
import { engineUpdateSchema } from "../../../../lib/schemas/motors.ts";
import { archiveEngine, getEngineFile, NO_ENGINE, updateEngine } from "../../../../server/services/engines-service.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { idParam } from "../../../../server/route-params.ts";

export const GET = defineApi({
  permission: "engine:read",
  handler: async ({ context, membership }) => getEngineFile(membership.organisationId, idParam(context.params, "id", NO_ENGINE)),
});

export const PATCH = defineApi({
  permission: "engine:update",
  input: engineUpdateSchema,
  handler: async (args) => ({ engine: await updateEngine(actorFrom(args), idParam(args.context.params, "id", NO_ENGINE), args.input) }),
});

/** Engines are never deleted: DELETE archives (PATCH {"archived": false} restores). */
export const DELETE = defineApi({
  permission: "engine:update",
  handler: async (args) => ({ engine: await archiveEngine(actorFrom(args), idParam(args.context.params, "id", NO_ENGINE)) }),
});
