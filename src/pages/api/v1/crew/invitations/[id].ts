import { defineApi } from "../../../../../server/http.ts";
import { revokeInvitation } from "../../../../../server/services/crew-service.ts";
import { notFound } from "../../../../../server/errors.ts";

export const DELETE = defineApi({
  permission: "crew:manage",
  handler: async ({ context, membership, userId }) => {
    const id = Number(context.params.id);
    if (!Number.isSafeInteger(id) || id <= 0) throw notFound("No pending invitation with that id.");
    await revokeInvitation({ organisationId: membership.organisationId, actorUserId: userId, invitationId: id, now: new Date() });
    return { revoked: true };
  },
});
