import { defineApi } from "../../../../../server/http.ts";
import { listMembers } from "../../../../../server/services/crew-service.ts";
import { can } from "../../../../../lib/permissions.ts";

export const GET = defineApi({
  permission: "crew:read",
  handler: async ({ membership }) => {
    const members = await listMembers(membership.organisationId);
    const showEmail = can(membership, "crew:manage") || membership.role !== "viewer";
    return { members: members.map((m) => (showEmail ? m : { ...m, email: null })) };
  },
});
