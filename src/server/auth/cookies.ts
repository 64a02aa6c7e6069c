import type { AstroCookies } from "astro";
import { lucia } from "./lucia.ts";

/** Sets the new session cookie and ends the session it replaces, if any. */
export async function setSessionCookie(context: { cookies: AstroCookies }, sessionId: string, previousSessionId?: string): Promise<void> {
  if (previousSessionId && previousSessionId !== sessionId) await lucia.invalidateSession(previousSessionId);
  const cookie = lucia.createSessionCookie(sessionId);
  context.cookies.set(cookie.name, cookie.value, cookie.attributes);
}

export function clearSessionCookie(context: { cookies: AstroCookies }): void {
  const cookie = lucia.createBlankSessionCookie();
  context.cookies.set(cookie.name, cookie.value, cookie.attributes);
}
