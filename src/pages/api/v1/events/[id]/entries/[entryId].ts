import { defineApi } from "../../../../../../server/http.ts";
import { entryPinSchema, fuelDecisionSchema } from "../../../../../../lib/schemas/season.ts";
import { idParam } from "../../../../../../server/route-params.ts";
import { actorFrom } from "../../../../../../server/services/motors-common.ts";
import { NO_ENTRY, pinEntryEngine } from "../../../../../../server/services/season-plan-service.ts";
import { recordFuelRun } from "../../../../../../server/services/season-service.ts";

/** Pins an engine to the entry ({"engineId": n}) and re-plans around it, or lifts the pin (null). */
export const PATCH = defineApi({
  permission: "season:plan",
  input: entryPinSchema,
  handler: async (args) => {
    const p = args.context.params;
    const diff = await pinEntryEngine(actorFrom(args), idParam(p, "id", NO_ENTRY), idParam(p, "entryId", NO_ENTRY), args.input.engineId);
    return { pinned: args.input.engineId !== null, diff };
  },
});

/** Records the fuel the crew ran for this entry ({"fuelRun": "…"}). */
export const POST = defineApi({
  permission: "fuel:decide",
  input: fuelDecisionSchema,
  handler: async (args) => {
    const p = args.context.params;
    return { event: await recordFuelRun(actorFrom(args), idParam(p, "id", NO_ENTRY), idParam(p, "entryId", NO_ENTRY), args.input.fuelRun) };
  },
});
