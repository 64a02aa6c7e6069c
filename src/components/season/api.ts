// The season island's calls to the server, each answering either the body or the server's
// plain-language error (a 409 carries the planner's reason).

export type Answer<T> = { ok: true; body: T } | { ok: false; status: number; message: string; fields?: Record<string, string> };

export async function callApi<T>(method: string, path: string, body?: unknown): Promise<Answer<T>> {
  try {
    const res = await fetch(path, {
      method,
      headers: body === undefined ? {} : { "content-type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const text = await res.text();
    const parsed = text ? (JSON.parse(text) as unknown) : null;
    if (res.ok) return { ok: true, body: parsed as T };
    const error = (parsed as { error?: { message?: string; fields?: Record<string, string> } } | null)?.error;
    return { ok: false, status: res.status, message: error?.message ?? `The server answered ${res.status}.`, fields: error?.fields };
  } catch {
    return { ok: false, status: 0, message: "Ringland cannot be reached right now; nothing was changed. Check the connection and try again." };
  }
}

/** "2026-12-05" → "Sat 5 Dec"; calendar days never pass through a time zone. */
export function formatDay(day: string, withYear = false): string {
  const d = new Date(`${day}T00:00:00Z`);
  const text = d.toLocaleDateString("en-GB", { weekday: "short", day: "numeric", month: "short", timeZone: "UTC", ...(withYear ? { year: "numeric" } : {}) });
  return text.replace(",", "");
}

export function formatRange(from: string, to: string): string {
  return from === to ? formatDay(from) : `${formatDay(from)} – ${formatDay(to)}`;
}

export function addDays(day: string, days: number): string {
  const d = new Date(`${day}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

/** Usage with at most two decimals and its unit ("1.5 h"). */
export function formatUsage(value: number, unit: string): string {
  const short = unit === "hours" ? "h" : unit === "kilometres" ? "km" : unit === "litres" ? "L" : unit;
  return `${Math.round(value * 100) / 100} ${short}`;
}
