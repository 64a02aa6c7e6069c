import { defineApi } from "../../../../server/http.ts";
import { readingSetPreviewSchema } from "../../../../lib/schemas/motors.ts";
import { previewReadingSet } from "../../../../server/services/readings-service.ts";

/** The figures of a set being typed (ratios, offset, spread, agreement, compliance); writes nothing. */
export const POST = defineApi({
  permission: "reading:create",
  input: readingSetPreviewSchema,
  handler: async ({ input, membership }) => ({ figures: await previewReadingSet(membership.organisationId, input) }),
});
