import { defineApi } from "../../../../server/http.ts";
import { listAudit } from "../../../../server/services/crew-service.ts";

export const GET = defineApi({
  permission: "audit:read",
  handler: async ({ membership }) => ({ entries: await listAudit(membership.organisationId, 100) }),
});
