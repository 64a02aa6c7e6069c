import { defineApi } from "../../../../server/http.ts";
import { exportQuerySchema } from "../../../../lib/schemas/motors.ts";
import { exportUsageCsv } from "../../../../server/services/exports-service.ts";
import { csvResponse } from "../../../../server/csv-response.ts";

export const GET = defineApi({
  permission: "export:read",
  input: exportQuerySchema,
  handler: async ({ input, membership }) => csvResponse(await exportUsageCsv(membership.organisationId, input)),
});
