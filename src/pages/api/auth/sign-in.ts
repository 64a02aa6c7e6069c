import { defineApi } from "../../../server/http.ts";
import { signInSchema } from "../../../lib/schemas/auth.ts";
import { signIn } from "../../../server/services/auth-service.ts";
import { setSessionCookie } from "../../../server/auth/cookies.ts";

export const POST = defineApi({
  permission: "public",
  input: signInSchema,
  handler: async ({ input, context }) => {
    const previous = context.locals.session?.id;
    const result = await signIn({ ...input, address: context.clientAddress, now: new Date() });
    await setSessionCookie(context, result.sessionId, previous);
    return { user: { id: result.userId, email: input.email } };
  },
});
