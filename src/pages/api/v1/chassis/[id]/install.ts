import { defineApi, json } from "../../../../../server/http.ts";
import { installSchema } from "../../../../../lib/schemas/motors.ts";
import { installEngine } from "../../../../../server/services/chassis-service.ts";
import { actorFrom } from "../../../../../server/services/motors-common.ts";
import { idParam } from "../../../../../server/route-params.ts";

export const POST = defineApi({
  permission: "chassis:update",
  input: installSchema,
  handler: async (args) =>
    json({ installation: await installEngine(actorFrom(args), idParam(args.context.params, "id", "No chassis with that id in this organisation."), args.input) }, 201),
});
