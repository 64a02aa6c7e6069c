import { computeEwma, DEFAULT_EWMA_LAMBDA, DEFAULT_EWMA_WIDTH } from "../../../../lib/domain/drift.ts";
import { driftRequestSchema, omitNulls } from "../../../../lib/schemas/calc.ts";
import { requireFiniteResponse } from "../../../../server/finite-response.ts";
import { defineApi } from "../../../../server/http.ts";

/** POST /api/v1/calc/drift: the EWMA chart of readings against their baseline (API.md). */
export const POST = defineApi({
  permission: "calc:use",
  input: driftRequestSchema,
  handler: async ({ input }) => {
    const { values, target, sigma, lambda, width, tolerance } = omitNulls(input);
    const result = computeEwma({ values, target, sigma, lambda, width, tolerance });
    return requireFiniteResponse({ ...result, lambda: lambda ?? DEFAULT_EWMA_LAMBDA, width: width ?? DEFAULT_EWMA_WIDTH });
  },
});
