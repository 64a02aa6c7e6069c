import { z } from "zod";
import { defineApi } from "../../../server/http.ts";
import { lucia } from "../../../server/auth/lucia.ts";
import { clearSessionCookie } from "../../../server/auth/cookies.ts";

/** Ends this session, or with {"everywhere": true} every session of the user. */
export const POST = defineApi({
  permission: "public",
  input: z.strictObject({ everywhere: z.boolean().optional() }),
  handler: async ({ input, context }) => {
    const session = context.locals.session;
    if (session) {
      if (input.everywhere) await lucia.invalidateUserSessions(session.userId);
      else await lucia.invalidateSession(session.id);
    }
    clearSessionCookie(context);
    return { signedOut: true };
  },
});
