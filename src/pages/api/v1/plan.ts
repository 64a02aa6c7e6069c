import { defineApi } from "../../../server/http.ts";
import { replanSchema } from "../../../lib/schemas/season.ts";
import { actorFrom } from "../../../server/services/motors-common.ts";
import { acceptReplan, getPlanView, previewReplan } from "../../../server/services/season-plan-service.ts";

/** The accepted plan: events with engines, jobs, projected due dates, conflicts, warnings, explanations and checks. */
export const GET = defineApi({
  permission: "season:read",
  handler: async ({ membership }) => getPlanView(membership.organisationId, new Date()),
});

/** Re-plans from today: {"accept": false} shows what would change; {"accept": true, "basis": …} applies it. */
export const POST = defineApi({
  permission: "season:plan",
  input: replanSchema,
  handler: async (args) => {
    const actor = actorFrom(args);
    if (args.input.accept === true) return { accepted: true, diff: await acceptReplan(actor, args.input.basis) };
    return { accepted: false, diff: await previewReplan(actor) };
  },
});
