// access: public
import type { APIRoute } from "astro";
import { lucia } from "../../server/auth/lucia.ts";
import { clearSessionCookie } from "../../server/auth/cookies.ts";

/** The sign-out form's target (Astro's origin check guards it); the JSON route is /api/auth/sign-out. */
export const POST: APIRoute = async (context) => {
  const session = context.locals.session;
  if (session) {
    if (context.url.searchParams.get("everywhere") === "1") await lucia.invalidateUserSessions(session.userId);
    else await lucia.invalidateSession(session.id);
  }
  clearSessionCookie(context);
  return context.redirect("/sign-in?signedOut=1", 303);
};
