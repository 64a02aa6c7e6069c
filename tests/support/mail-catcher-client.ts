// Reads what the local mail catcher (scripts/services/mail-catcher.ts) received, over its JSON API.

export interface CaughtMessage {
  id: string;
  receivedAt: string;
  /** Bare address from the From header (envelope sender when the header has none). */
  from: string;
  /** Display name from the From header, e.g. "Ringland". */
  fromName: string | null;
  /** Bare addresses from the To header (envelope recipients when the header has none). */
  to: string[];
  envelope: { from: string | null; to: string[] };
  subject: string;
  text: string;
  html: string | null;
  /** Selected headers with lower-case names: list-unsubscribe, message-id, reply-to, x-* ... */
  headers: Record<string, string>;
  attachments: {
    filename: string | null;
    contentType: string;
    sizeBytes: number;
    contentId: string | null;
    checksum: string;
  }[];
}

function buildUrl(baseUrl: string, pathname: string): URL {
  return new URL(pathname, baseUrl.endsWith("/") ? baseUrl : `${baseUrl}/`);
}

export async function listMessages(baseUrl: string, opts: { to?: string } = {}): Promise<CaughtMessage[]> {
  const url = buildUrl(baseUrl, "api/messages");
  if (opts.to) url.searchParams.set("to", opts.to);
  const res = await fetch(url);
  if (!res.ok) throw new Error(`mail catcher answered ${res.status} for GET ${url.pathname}`);
  return (await res.json()) as CaughtMessage[];
}

export async function clearMessages(baseUrl: string): Promise<number> {
  const url = buildUrl(baseUrl, "api/messages");
  const res = await fetch(url, { method: "DELETE" });
  if (!res.ok) throw new Error(`mail catcher answered ${res.status} for DELETE ${url.pathname}`);
  const body = (await res.json()) as { deleted: number };
  return body.deleted;
}

/**
 * Polls until at least `count` messages satisfy the predicate, and returns those (newest first).
 * Rejects with what did arrive when the time runs out, which makes a failing test readable.
 */
export async function waitForMessages(
  baseUrl: string,
  predicate: (message: CaughtMessage) => boolean,
  timeoutMs = 5000,
  opts: { count?: number; intervalMs?: number; to?: string } = {},
): Promise<CaughtMessage[]> {
  const count = opts.count ?? 1;
  const intervalMs = opts.intervalMs ?? 100;
  const deadline = Date.now() + timeoutMs;
  let seen: CaughtMessage[] = [];
  for (;;) {
    seen = await listMessages(baseUrl, { to: opts.to });
    const matching = seen.filter(predicate);
    if (matching.length >= count) return matching;
    if (Date.now() >= deadline) break;
    await new Promise((resolve) => setTimeout(resolve, intervalMs));
  }
  const subjects = seen.map((m) => `"${m.subject}" to ${m.to.join(", ")}`).join("; ") || "none";
  throw new Error(`waited ${timeoutMs} ms for ${count} matching message(s); caught: ${subjects}`);
}
