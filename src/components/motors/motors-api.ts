import { formatQuantity, type QuantityKind, type UnitChoice } from "../../lib/domain/units.ts";
import type { UsageUnit } from "../../lib/motors/types.ts";

// The Motors islands' calls to the server. Failures throw ApiError with the server's own
// plain-language message and the fields it named, so a form can put each on its field.

export class ApiError extends Error {
  constructor(
    public readonly status: number,
    message: string,
    public readonly fields: Record<string, string> = {},
  ) {
    super(message);
    this.name = "ApiError";
  }
}

const OFFLINE = "Ringland cannot be reached right now; nothing was changed. Check the connection and try again.";

export async function requestJson<T>(method: string, path: string, body?: unknown): Promise<T> {
  let res: Response;
  try {
    res = await fetch(path, {
      method,
      headers: body === undefined ? { accept: "application/json" } : { "content-type": "application/json", accept: "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    throw new ApiError(0, OFFLINE);
  }
  const text = await res.text();
  let parsed: unknown = null;
  try {
    parsed = text ? JSON.parse(text) : null;
  } catch {
    parsed = null;
  }
  if (res.ok) return parsed as T;
  const error = (parsed as { error?: { message?: string; fields?: Record<string, string> } } | null)?.error;
  throw new ApiError(res.status, error?.message ?? `The server answered ${res.status}.`, error?.fields ?? {});
}

export function getJson<T>(path: string): Promise<T> {
  return requestJson<T>("GET", path);
}

/** Query string from the non-empty values. */
export function toQuery(params: Record<string, string | number | boolean | null | undefined>): string {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== null && v !== "" && v !== false) q.set(k, String(v));
  const s = q.toString();
  return s ? `?${s}` : "";
}

export const USAGE_UNIT_SHORT: Record<UsageUnit, string> = { hours: "h", kilometres: "km", laps: "laps", litres: "L" };

/** Usage with at most two decimals and its unit: "5.5 h". */
export function formatUsage(value: number, unit: UsageUnit): string {
  return `${Math.round(value * 100) / 100} ${USAGE_UNIT_SHORT[unit]}`;
}

/** A domain value in the person's units, or a dash when there is none. */
export function formatOrDash(kind: QuantityKind, value: number | null | undefined, units: UnitChoice): string {
  return value === null || value === undefined || !Number.isFinite(value) ? "—" : formatQuantity(kind, value, units);
}

/** "2026-12-05" → "5 Dec 2026"; calendar days never pass through a time zone. */
export function formatDate(day: string, withYear = true): string {
  const d = new Date(`${day.slice(0, 10)}T00:00:00Z`);
  if (Number.isNaN(d.getTime())) return day;
  return d.toLocaleDateString("en-GB", { day: "numeric", month: "short", timeZone: "UTC", ...(withYear ? { year: "numeric" } : {}) });
}

/** Lets the other islands of a page (the timeline) know that something was saved. */
export const MOTORS_CHANGED_EVENT = "ringland:motors-changed";
