import { defineApi } from "../../../../../../server/http.ts";
import { archiveService, NO_ENGINE } from "../../../../../../server/services/engines-service.ts";
import { actorFrom } from "../../../../../../server/services/motors-common.ts";
import { idParam } from "../../../../../../server/route-params.ts";

/** A service record entered by mistake is archived; the counters fall back to the one before. */
export const DELETE = defineApi({
  permission: "job:work",
  handler: async (args) => ({
    service: await archiveService(
      actorFrom(args),
      idParam(args.context.params, "id", NO_ENGINE),
      idParam(args.context.params, "serviceId", "No service record with that id on this engine."),
    ),
  }),
});
