import { defineApi } from "../../../../server/http.ts";
import { signalActionSchema } from "../../../../lib/schemas/signals.ts";
import { acknowledgeSignal, resolveSignal } from "../../../../server/services/signals-service.ts";
import { notFound } from "../../../../server/errors.ts";

/** POST {"action":"acknowledge"} or {"action":"resolve","note":"…"}. */
export const POST = defineApi({
  permission: "signal:manage",
  input: signalActionSchema,
  handler: async ({ input, context, membership, userId }) => {
    const id = Number(context.params.id);
    if (!Number.isSafeInteger(id) || id <= 0) throw notFound("No such signal in this organisation.");
    if (input.action === "acknowledge") await acknowledgeSignal(membership.organisationId, userId, id, new Date());
    else await resolveSignal(membership.organisationId, userId, id, input.note, new Date());
    return { id, state: input.action === "acknowledge" ? "acknowledged" : "resolved" };
  },
});
