import { defineApi } from "../../../../../server/http.ts";
import { inviteSchema } from "../../../../../lib/schemas/auth.ts";
import { inviteMember, listPendingInvitations } from "../../../../../server/services/crew-service.ts";

export const GET = defineApi({
  permission: "crew:manage",
  handler: async ({ membership }) => ({ invitations: await listPendingInvitations(membership.organisationId, new Date()) }),
});

export const POST = defineApi({
  permission: "crew:manage",
  input: inviteSchema,
  handler: async ({ input, context, membership, userId }) => {
    const result = await inviteMember({
      organisationId: membership.organisationId,
      organisationName: membership.organisationName,
      actorUserId: userId,
      actorName: context.locals.user?.name ?? "A Ringland owner",
      email: input.email,
      role: input.role,
      now: new Date(),
    });
    return new Response(JSON.stringify(result), { status: 201, headers: { "content-type": "application/json" } });
  },
});
