import type { Knex } from "knex";
import { db } from "../../db/client.ts";
import { DEFAULT_CHAMBER_TOLERANCE_CC } from "../../lib/domain/readings.ts";
import type { CounterLevel, IntervalCounter, UsageUnit } from "../../lib/motors/types.ts";
import type { ActiveMembership } from "../auth/guard.ts";
import { badRequest } from "../errors.ts";

/** Who is changing something, in which organisation, and when. */
export interface Actor {
  membership: ActiveMembership;
  userId: string;
  now: Date;
}

export interface OrgMotorSettings {
  organisationId: number;
  usageUnit: UsageUnit;
  timeZone: string;
  shopElevationM: number | null;
  chamberToleranceCc: number;
}

/** The organisation's settings the motors need; the tolerance column may be absent in older schemas. */
export async function loadOrgSettings(organisationId: number, k: Knex = db()): Promise<OrgMotorSettings> {
  const row = await k("organisations").where({ id: organisationId }).first();
  const tolerance = row?.chamber_tolerance_cc;
  return {
    organisationId,
    usageUnit: (row?.usage_unit ?? "hours") as UsageUnit,
    timeZone: row?.time_zone ?? "UTC",
    shopElevationM: row?.shop_elevation_m ?? null,
    chamberToleranceCc: typeof tolerance === "number" && tolerance >= 0 ? tolerance : DEFAULT_CHAMBER_TOLERANCE_CC,
  };
}

/** The calendar day of an instant in a time zone, as YYYY-MM-DD. */
export function dayIn(instant: Date, timeZone: string): string {
  try {
    return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(instant);
  } catch {
    return instant.toISOString().slice(0, 10);
  }
}

/** A day in the organisation's calendar must not lie after its today. */
export function requireNotAfterToday(field: string, day: string, now: Date, timeZone: string): void {
  if (day > dayIn(now, timeZone)) throw badRequest("That date lies in the future.", { [field]: "This date lies in the future." });
}

/** "2026-12-01" → midnight UTC; a full ISO instant stays as given. */
export function parseInstant(value: string | undefined, now: Date): Date {
  if (!value) return now;
  return new Date(/^\d{4}-\d{2}-\d{2}$/.test(value) ? `${value}T00:00:00Z` : value);
}

/** Instants may run a few minutes ahead of the server clock (a phone's clock), never more. */
export function requireNotFutureInstant(field: string, instant: Date, now: Date): void {
  if (instant.getTime() > now.getTime() + 10 * 60_000) {
    throw badRequest("That time lies in the future.", { [field]: "This time lies in the future." });
  }
}

export function toIntervalCounter(used: number, limit: number | null, planFraction: number, lastOn: string | null): IntervalCounter {
  const share = limit !== null && limit > 0 ? used / limit : null;
  let level: CounterLevel | null = null;
  if (share !== null) level = share >= 1 ? "act" : share >= planFraction ? "watch" : "fine";
  return { used: roundUsage(used), limit, share, level, lastOn };
}

/** Usage sums are DECIMAL(10,2) values; keep binary round-off out of the API. */
export function roundUsage(value: number): number {
  return Math.round(value * 100) / 100;
}

/** A chassis meter counts usage only when it measures in the organisation's unit. */
export function meterMatchesUnit(meterKind: string, unit: UsageUnit): boolean {
  return (meterKind === "hours" && unit === "hours") || (meterKind === "km" && unit === "kilometres");
}

export function pageOf(query: { page?: number; perPage?: number }, defaultSize: number): { page: number; perPage: number; offset: number } {
  const page = query.page ?? 1;
  const perPage = query.perPage ?? defaultSize;
  return { page, perPage, offset: (page - 1) * perPage };
}

/** Field-by-field differences for the audit log. */
export function describeChanges(
  before: Record<string, unknown>,
  after: Record<string, unknown>,
): Record<string, { from: unknown; to: unknown }> {
  const out: Record<string, { from: unknown; to: unknown }> = {};
  for (const [key, to] of Object.entries(after)) {
    if (to === undefined) continue;
    const from = before[key];
    if (JSON.stringify(from) !== JSON.stringify(to)) out[key] = { from: from ?? null, to };
  }
  return out;
}

/** The actor of an API call: the handler's membership and user, at the server's now. */
export function actorFrom(args: { membership: ActiveMembership; userId: string }): Actor {
  return { membership: args.membership, userId: args.userId, now: new Date() };
}
