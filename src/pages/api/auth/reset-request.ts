import { defineApi } from "../../../server/http.ts";
import { resetRequestSchema } from "../../../lib/schemas/auth.ts";
import { requestPasswordReset } from "../../../server/services/auth-service.ts";

export const POST = defineApi({
  permission: "public",
  input: resetRequestSchema,
  handler: async ({ input }) => {
    await requestPasswordReset(input.email, new Date());
    return { message: "If that e-mail has an account, a reset link is on its way." };
  },
});
