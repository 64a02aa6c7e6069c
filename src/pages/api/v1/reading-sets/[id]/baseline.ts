import { defineApi } from "../../../../../server/http.ts";
import { baselineSchema } from "../../../../../lib/schemas/motors.ts";
import { actorFrom } from "../../../../../server/services/motors-common.ts";
import { setBaseline } from "../../../../../server/services/readings-service.ts";
import { idParam } from "../../../../../server/route-params.ts";

export const POST = defineApi({
  permission: "reading:baseline",
  input: baselineSchema,
  handler: async (args) => ({
    readingSet: await setBaseline(actorFrom(args), idParam(args.context.params, "id", "No reading set with that id in this organisation."), args.input.isBaseline),
  }),
});
