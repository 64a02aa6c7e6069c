import { defineApi } from "../../../../../server/http.ts";
import { removeSchema } from "../../../../../lib/schemas/motors.ts";
import { removeEngine } from "../../../../../server/services/chassis-service.ts";
import { actorFrom } from "../../../../../server/services/motors-common.ts";
import { idParam } from "../../../../../server/route-params.ts";

export const POST = defineApi({
  permission: "chassis:update",
  input: removeSchema,
  handler: async (args) => ({
    installation: await removeEngine(actorFrom(args), idParam(args.context.params, "id", "No chassis with that id in this organisation."), args.input),
  }),
});
