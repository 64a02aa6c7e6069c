import { defineApi } from "../../../../../server/http.ts";
import { usageImportSchema } from "../../../../../lib/schemas/motors.ts";
import { previewImport } from "../../../../../server/services/usage-import-service.ts";

/** Step one: what would be written, what is already there, and every bad row with its reason. Writes nothing. */
export const POST = defineApi({
  permission: "usage:log",
  input: usageImportSchema,
  handler: async ({ input, membership }) => previewImport(membership.organisationId, input, new Date()),
});
