import { defineApi } from "../../../server/http.ts";
import { acceptInvitationSchema } from "../../../lib/schemas/auth.ts";
import { acceptInvitation } from "../../../server/services/crew-service.ts";
import { lucia } from "../../../server/auth/lucia.ts";
import { setSessionCookie } from "../../../server/auth/cookies.ts";

export const POST = defineApi({
  permission: "public",
  input: acceptInvitationSchema,
  handler: async ({ input, context }) => {
    const { userId } = await acceptInvitation({ ...input, now: new Date() });
    const session = await lucia.createSession(userId, {});
    await setSessionCookie(context, session.id, context.locals.session?.id);
    return { userId };
  },
});
