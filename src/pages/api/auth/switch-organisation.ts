import { defineApi } from "../../../server/http.ts";
import { switchOrgSchema } from "../../../lib/schemas/auth.ts";
import { switchOrganisation } from "../../../server/services/auth-service.ts";

export const POST = defineApi({
  permission: "signed-in",
  input: switchOrgSchema,
  handler: async ({ input, userId }) => {
    await switchOrganisation(userId, input.organisationId);
    return { organisationId: input.organisationId };
  },
});
