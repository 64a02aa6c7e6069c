import { defineApi } from "../../../../../server/http.ts";
import { usageImportSchema } from "../../../../../lib/schemas/motors.ts";
import { actorFrom } from "../../../../../server/services/motors-common.ts";
import { commitImport } from "../../../../../server/services/usage-import-service.ts";

/** Step two: writes the new rows in one transaction; rows imported before are skipped, never doubled. */
export const POST = defineApi({
  permission: "usage:log",
  input: usageImportSchema,
  handler: async (args) => commitImport(actorFrom(args), args.input),
});
