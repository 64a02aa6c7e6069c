import { defineApi } from "../../../../../server/http.ts";
import { partMoveSchema } from "../../../../../lib/schemas/motors.ts";
import { actorFrom } from "../../../../../server/services/motors-common.ts";
import { movePart } from "../../../../../server/services/parts-service.ts";
import { idParam } from "../../../../../server/route-params.ts";

export const POST = defineApi({
  permission: "part:update",
  input: partMoveSchema,
  handler: async (args) => ({ part: await movePart(actorFrom(args), idParam(args.context.params, "id", "No part with that id in this organisation."), args.input) }),
});
