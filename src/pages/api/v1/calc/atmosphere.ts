import { computeAtmosphere } from "../../../../lib/domain/calc-api.ts";
import { atmosphereQuerySchema } from "../../../../lib/schemas/calc.ts";
import { requireFiniteResponse } from "../../../../server/finite-response.ts";
import { defineApi } from "../../../../server/http.ts";

/** GET /api/v1/calc/atmosphere?elevationM=…: the standard atmosphere at a geometric elevation. */
export const GET = defineApi({
  permission: "calc:use",
  input: atmosphereQuerySchema,
  handler: async ({ input }) => {
    const { pressureKpa, temperatureC, densityKgM3, pressureRatio, geopotentialM } = computeAtmosphere(input);
    return requireFiniteResponse({
      elevationM: input.elevationM,
      geopotentialM,
      pressureKpa,
      temperatureC,
      densityKgM3,
      pressureRatio,
      model: "U.S. Standard Atmosphere 1976, troposphere; elevation is geometric, above sea level",
    });
  },
});
