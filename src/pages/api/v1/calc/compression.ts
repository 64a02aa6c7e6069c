import { computeCompression } from "../../../../lib/domain/calc-api.ts";
import { compressionRequestSchema, omitNulls } from "../../../../lib/schemas/calc.ts";
import { requireFiniteResponse } from "../../../../server/finite-response.ts";
import { defineApi } from "../../../../server/http.ts";

/** POST /api/v1/calc/compression: volumes and ratios from measurements (API.md). */
export const POST = defineApi({
  permission: "calc:use",
  input: compressionRequestSchema,
  handler: async ({ input }) => requireFiniteResponse(computeCompression(omitNulls(input))),
});
