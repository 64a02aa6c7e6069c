import type { Knex } from "knex";
import type { ClosedDay, EventKind, SeasonEntry, SeasonEvent, ShopSettings } from "../lib/season/types.ts";
import { db } from "./client.ts";
import { toIso, toNumber, toNumberOrNull } from "./row-values.ts";

// Typed queries for events, their entries, the shop's settings and closed days. No rules here:
// the season services decide what may change.

export interface EventRow {
  id: number;
  organisation_id: number;
  name: string;
  venue: string | null;
  starts_on: string;
  ends_on: string;
  elevation_m: number;
  expected_air_temp_c: number | null;
  kind: EventKind;
  important: number | boolean;
  notes: string | null;
  archived_at: Date | null;
}

export interface EntryRow {
  id: number;
  event_id: number;
  chassis_id: number;
  chassis_number: string;
  expected_usage: number;
  engine_id: number | null;
  engine_name: string | null;
  engine_pinned: number | boolean;
  fuel_run: string | null;
  fuel_decided_by: string | null;
  fuel_decided_by_name: string | null;
  fuel_decided_at: Date | null;
}

export function toSeasonEntry(r: EntryRow, usageLeftAfter: number | null = null): SeasonEntry {
  return {
    id: Number(r.id),
    eventId: Number(r.event_id),
    chassisId: Number(r.chassis_id),
    chassisNumber: r.chassis_number,
    expectedUsage: toNumber(r.expected_usage),
    engineId: r.engine_id === null ? null : Number(r.engine_id),
    engineName: r.engine_name,
    pinned: Boolean(r.engine_pinned),
    usageLeftAfter,
    fuelRun: r.fuel_run,
    fuelDecidedBy: r.fuel_decided_by ? { id: r.fuel_decided_by, name: r.fuel_decided_by_name ?? "" } : null,
    fuelDecidedAt: toIso(r.fuel_decided_at),
  };
}

export function toSeasonEvent(r: EventRow, entries: SeasonEntry[]): SeasonEvent {
  return {
    id: Number(r.id),
    name: r.name,
    venue: r.venue,
    startsOn: r.starts_on,
    endsOn: r.ends_on,
    elevationM: Number(r.elevation_m),
    expectedAirTempC: toNumberOrNull(r.expected_air_temp_c),
    kind: r.kind,
    important: Boolean(r.important),
    notes: r.notes,
    archived: r.archived_at !== null,
    entries,
  };
}

export async function findEventRow(organisationId: number, id: number, k: Knex = db(), forUpdate = false): Promise<EventRow | undefined> {
  const q = k<EventRow>("events").where({ organisation_id: organisationId, id });
  if (forUpdate) q.forUpdate();
  return q.first();
}

export interface EventFilter {
  /** Events that end on or after this day. */
  from?: string;
  /** Events that start on or before this day. */
  to?: string;
  includeArchived?: boolean;
  limit?: number;
}

export async function listEventRows(organisationId: number, f: EventFilter = {}, k: Knex = db()): Promise<EventRow[]> {
  const q = k<EventRow>("events").where({ organisation_id: organisationId });
  if (!f.includeArchived) q.whereNull("archived_at");
  if (f.from) q.where("ends_on", ">=", f.from);
  if (f.to) q.where("starts_on", "<=", f.to);
  q.orderBy("starts_on").orderBy("ends_on").orderBy("id");
  if (f.limit) q.limit(f.limit);
  return q;
}

export async function listEntryRows(eventIds: number[], k: Knex = db()): Promise<EntryRow[]> {
  if (eventIds.length === 0) return [];
  return k("event_entries as x")
    .join("chassis as c", "c.id", "x.chassis_id")
    .leftJoin("engines as e", "e.id", "x.engine_id")
    .leftJoin("users as u", "u.id", "x.fuel_decided_by")
    .whereIn("x.event_id", eventIds)
    .select("x.*", "c.number as chassis_number", "e.name as engine_name", "u.name as fuel_decided_by_name")
    .orderByRaw("LENGTH(c.number), c.number");
}

export async function findEntryRow(organisationId: number, eventId: number, entryId: number, k: Knex = db(), forUpdate = false): Promise<EntryRow | undefined> {
  const q = k("event_entries as x")
    .join("events as ev", "ev.id", "x.event_id")
    .join("chassis as c", "c.id", "x.chassis_id")
    .leftJoin("engines as e", "e.id", "x.engine_id")
    .leftJoin("users as u", "u.id", "x.fuel_decided_by")
    .where({ "ev.organisation_id": organisationId, "x.event_id": eventId, "x.id": entryId })
    .select("x.*", "c.number as chassis_number", "e.name as engine_name", "u.name as fuel_decided_by_name");
  if (forUpdate) q.forUpdate();
  return q.first();
}

/** The ids of those chassis that belong to the organisation and are not archived. */
export async function findLiveChassisIds(organisationId: number, ids: number[], k: Knex = db()): Promise<Set<number>> {
  if (ids.length === 0) return new Set();
  const rows = await k("chassis").where({ organisation_id: organisationId }).whereIn("id", ids).whereNull("archived_at").select("id");
  return new Set(rows.map((r) => Number(r.id)));
}

/** Defaults until the organisation saves its own (TRADE.md, from memory: about 30 shop hours a week in season, twin top end 3–5 h, bottom end 10–14 h). */
export const DEFAULT_SHOP: Omit<ShopSettings, "isDefault"> = Object.freeze({
  hoursPerWeekday: [6, 6, 6, 6, 6, 0, 0],
  travelDaysBeforeEvent: 1,
  topEndHours: 4,
  bottomEndHours: 12,
  inspectionHours: 1.5,
  partsLeadDays: 3,
});

export async function loadShopSettings(organisationId: number, k: Knex = db()): Promise<ShopSettings> {
  const r = await k("shop_settings").where({ organisation_id: organisationId }).first();
  if (!r) return { ...DEFAULT_SHOP, hoursPerWeekday: [...DEFAULT_SHOP.hoursPerWeekday], isDefault: true };
  const raw = typeof r.hours_per_weekday === "string" ? JSON.parse(r.hours_per_weekday) : r.hours_per_weekday;
  return {
    hoursPerWeekday: (raw as unknown[]).map((h) => toNumber(h)),
    travelDaysBeforeEvent: Number(r.travel_days_before_event),
    topEndHours: toNumber(r.top_end_hours),
    bottomEndHours: toNumber(r.bottom_end_hours),
    inspectionHours: toNumber(r.inspection_hours),
    partsLeadDays: Number(r.parts_lead_days),
    isDefault: false,
  };
}

export async function saveShopSettings(organisationId: number, s: Omit<ShopSettings, "isDefault">, k: Knex): Promise<void> {
  const row = {
    hours_per_weekday: JSON.stringify(s.hoursPerWeekday),
    travel_days_before_event: s.travelDaysBeforeEvent,
    top_end_hours: s.topEndHours,
    bottom_end_hours: s.bottomEndHours,
    inspection_hours: s.inspectionHours,
    parts_lead_days: s.partsLeadDays,
  };
  await k("shop_settings")
    .insert({ organisation_id: organisationId, ...row })
    .onConflict("organisation_id")
    .merge({ ...row, updated_at: k.fn.now() });
}

export async function listClosedDays(organisationId: number, from: string | null, k: Knex = db()): Promise<ClosedDay[]> {
  const q = k("shop_closed_days").where({ organisation_id: organisationId });
  if (from) q.where("day", ">=", from);
  const rows = await q.orderBy("day");
  return rows.map((r) => ({ id: Number(r.id), day: r.day, reason: r.reason ?? null }));
}
