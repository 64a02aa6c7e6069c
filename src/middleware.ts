import { defineMiddleware } from "astro:middleware";
import { randomUUID } from "node:crypto";
import { lucia } from "./server/auth/lucia.ts";
import { listMembershipsOfUser } from "./db/memberships-repo.ts";
import { isDatabaseUnavailable } from "./db/client.ts";
import { errorResponse } from "./server/http.ts";
import { securityHeaders } from "./server/security-headers.ts";
import { unauthorized } from "./server/errors.ts";

/** Paths that answer without a session. Everything else needs one. */
const PUBLIC_PREFIXES = ["/sign-in", "/reset", "/invite/", "/api/auth/", "/api/health", "/unsubscribe/", "/ical/", "/_astro/", "/favicon"];

function isPublic(pathname: string): boolean {
  return PUBLIC_PREFIXES.some((p) => pathname === p || pathname.startsWith(p));
}

function unavailablePage(): Response {
  const html = `<!doctype html><html lang="en"><meta charset="utf-8"><title>Ringland is catching its breath</title>
<body style="font-family:sans-serif;background:#f6f1e7;color:#26231f;padding:2rem;max-width:40rem">
<h1>Ringland cannot reach its database right now</h1><p>Nothing you entered was lost on our side. Try again in a moment.</p></body></html>`;
  return new Response(html, { status: 503, headers: { "content-type": "text/html; charset=utf-8", "retry-after": "5" } });
}

export const onRequest = defineMiddleware(async (context, next) => {
  const { pathname } = context.url;
  context.locals.requestId = randomUUID();
  context.locals.user = null;
  context.locals.session = null;
  context.locals.membership = null;
  context.locals.memberships = [];

  if (pathname.startsWith("/_astro/")) return next();

  const isApi = pathname.startsWith("/api/");
  try {
    const sessionId = context.cookies.get(lucia.sessionCookieName)?.value ?? null;
    if (sessionId && /^[a-z0-9]{10,64}$/i.test(sessionId)) {
      const { session, user } = await lucia.validateSession(sessionId);
      if (session && session.fresh) {
        const c = lucia.createSessionCookie(session.id);
        context.cookies.set(c.name, c.value, c.attributes);
      }
      if (!session) {
        const c = lucia.createBlankSessionCookie();
        context.cookies.set(c.name, c.value, c.attributes);
      }
      if (user && session) {
        context.locals.user = user;
        context.locals.session = session;
        const memberships = await listMembershipsOfUser(user.id);
        context.locals.memberships = memberships;
        context.locals.membership =
          memberships.find((m) => m.organisationId === Number(user.lastOrgId)) ?? memberships[0] ?? null;
      }
    } else if (sessionId) {
      // A malformed cookie is treated as no session, and cleared.
      const c = lucia.createBlankSessionCookie();
      context.cookies.set(c.name, c.value, c.attributes);
    }
  } catch (err) {
    if (isDatabaseUnavailable(err)) return withHeaders(isApi ? errorResponse(err) : unavailablePage(), isApi);
    throw err;
  }

  if (!context.locals.user && !isPublic(pathname)) {
    if (isApi) return withHeaders(errorResponse(unauthorized()), true);
    const back = pathname === "/" ? "" : `?next=${encodeURIComponent(pathname + context.url.search)}`;
    return context.redirect(`/sign-in${back}`, 303);
  }

  try {
    const response = await next();
    return withHeaders(response, isApi);
  } catch (err) {
    if (isApi) return withHeaders(errorResponse(err), true);
    if (isDatabaseUnavailable(err)) return withHeaders(unavailablePage(), false);
    throw err;
  }
});

function withHeaders(response: Response, isApi: boolean): Response {
  for (const [k, v] of Object.entries(securityHeaders(isApi))) {
    try {
      response.headers.set(k, v);
    } catch {
      // Some responses (redirects from Response.redirect) have immutable headers.
    }
  }
  return response;
}
