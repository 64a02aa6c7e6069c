import { defineApi } from "../../../server/http.ts";
import { resetSchema } from "../../../lib/schemas/auth.ts";
import { resetPassword } from "../../../server/services/auth-service.ts";

export const POST = defineApi({
  permission: "public",
  input: resetSchema,
  handler: async ({ input }) => {
    await resetPassword(input.token, input.password, new Date());
    return { message: "Password changed. Sign in with the new one." };
  },
});
