import { defineApi } from "../../../../../server/http.ts";
import { roleChangeSchema } from "../../../../../lib/schemas/auth.ts";
import { changeRole, removeMember } from "../../../../../server/services/crew-service.ts";
import { notFound } from "../../../../../server/errors.ts";

function userIdParam(params: Record<string, string | undefined>): string {
  const id = params.userId ?? "";
  if (!/^[a-z0-9]{1,40}$/i.test(id)) throw notFound("That person is not a member of this organisation.");
  return id;
}

export const PATCH = defineApi({
  permission: "crew:manage",
  input: roleChangeSchema,
  handler: async ({ input, context, membership, userId }) => {
    await changeRole({ organisationId: membership.organisationId, actorUserId: userId, userId: userIdParam(context.params), role: input.role });
    return { role: input.role };
  },
});

export const DELETE = defineApi({
  permission: "crew:manage",
  handler: async ({ context, membership, userId }) => {
    await removeMember({ organisationId: membership.organisationId, actorUserId: userId, userId: userIdParam(context.params) });
    return { removed: true };
  },
});
