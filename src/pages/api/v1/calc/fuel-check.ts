import { computeFuelCheck } from "../../../../lib/domain/calc-api.ts";
import { fuelCheckRequestSchema, omitNulls } from "../../../../lib/schemas/calc.ts";
import { requireFiniteResponse } from "../../../../server/finite-response.ts";
import { defineApi } from "../../../../server/http.ts";
import { loadOrganisationFuelTable, type FuelTableSource } from "../../../../server/services/workbench-service.ts";

/**
 * POST /api/v1/calc/fuel-check (API.md). Without a fuelTable the organisation's table applies
 * (Settings); an organisation that has not made one yet runs on Ringland's seed table of
 * common-practice defaults, and the answer says which (fuelTableSource, fuelTableLabel and,
 * for the defaults, a caution).
 */
export const POST = defineApi({
  permission: "calc:use",
  input: fuelCheckRequestSchema,
  handler: async ({ input, membership }) => {
    const given = omitNulls(input);
    let fuelTableSource: FuelTableSource = "request";
    if (given.fuelTable === undefined) {
      const own = await loadOrganisationFuelTable(membership.organisationId);
      fuelTableSource = own ? "organisation" : "seed-defaults";
      if (own) given.fuelTable = own;
    }
    return requireFiniteResponse({ ...computeFuelCheck(given), fuelTableSource });
  },
});
