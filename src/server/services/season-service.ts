import type { Knex } from "knex";
import { db } from "../../db/client.ts";
import { assembleJobs, listJobRows } from "../../db/jobs-repo.ts";
import { isDuplicateKey, roundTo } from "../../db/row-values.ts";
import {
  findEventRow,
  findLiveChassisIds,
  listClosedDays,
  listEntryRows,
  listEventRows,
  loadShopSettings,
  saveShopSettings,
  toSeasonEntry,
  toSeasonEvent,
  type EventFilter,
  type EventRow,
} from "../../db/season-repo.ts";
import type { BenchJob, ClosedDay, SeasonEvent, ShopSettings } from "../../lib/season/types.ts";
import { checkEventDates } from "../../lib/schemas/season.ts";
import { badRequest, conflict, notFound } from "../errors.ts";
import { writeAudit } from "./audit.ts";
import type { Actor } from "./motors-common.ts";
import { shiftDay } from "./season-input.ts";
import { findToday } from "./season-plan-service.ts";

// Events with their entries, the shop's hours and closed days, and the fuel the crew ran. Each
// change is one transaction with its audit line; a plan is only changed by re-planning.

export const NO_EVENT = "No event with that id in this organisation.";

export interface EventInput {
  name?: string;
  venue?: string | null;
  startsOn?: string;
  endsOn?: string;
  elevationM?: number;
  expectedAirTempC?: number | null;
  kind?: "practice" | "race" | "test";
  important?: boolean;
  notes?: string | null;
  entries?: { chassisId: number; expectedUsage: number }[];
}

async function assembleEvents(rows: EventRow[], k: Knex): Promise<SeasonEvent[]> {
  const entries = await listEntryRows(rows.map((r) => Number(r.id)), k);
  return rows.map((ev) => toSeasonEvent(ev, entries.filter((x) => Number(x.event_id) === Number(ev.id)).map((x) => toSeasonEntry(x))));
}

export async function listEvents(organisationId: number, filter: EventFilter): Promise<SeasonEvent[]> {
  return assembleEvents(await listEventRows(organisationId, filter), db());
}

export async function getEvent(organisationId: number, eventId: number, k: Knex = db()): Promise<SeasonEvent> {
  const row = await findEventRow(organisationId, eventId, k);
  if (!row) throw notFound(NO_EVENT);
  return (await assembleEvents([row], k))[0];
}

function toEventColumns(input: EventInput): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  if (input.name !== undefined) out.name = input.name;
  if (input.venue !== undefined) out.venue = input.venue || null;
  if (input.startsOn !== undefined) out.starts_on = input.startsOn;
  if (input.endsOn !== undefined) out.ends_on = input.endsOn;
  if (input.elevationM !== undefined) out.elevation_m = Math.round(input.elevationM);
  if (input.expectedAirTempC !== undefined) out.expected_air_temp_c = input.expectedAirTempC === null ? null : roundTo(input.expectedAirTempC, 1);
  if (input.kind !== undefined) out.kind = input.kind;
  if (input.important !== undefined) out.important = input.important;
  if (input.notes !== undefined) out.notes = input.notes || null;
  return out;
}

/** Checks every entry's chassis at once, so a 400 names each bad one. */
async function checkEntries(organisationId: number, entries: NonNullable<EventInput["entries"]>, k: Knex): Promise<void> {
  const fields: Record<string, string> = {};
  const live = await findLiveChassisIds(organisationId, entries.map((e) => e.chassisId), k);
  const seen = new Set<number>();
  entries.forEach((e, i) => {
    if (!live.has(e.chassisId)) fields[`entries.${i}.chassisId`] = "No such chassis in this organisation.";
    else if (seen.has(e.chassisId)) fields[`entries.${i}.chassisId`] = "This chassis is already entered in the event.";
    seen.add(e.chassisId);
  });
  if (Object.keys(fields).length) throw badRequest("Check the entries.", fields);
}

/** Keeps each entry whose chassis stays (its engine, pin and fuel record with it), adds and removes the rest. */
async function replaceEntries(trx: Knex, eventId: number, entries: NonNullable<EventInput["entries"]>): Promise<void> {
  const existing = await trx("event_entries").where({ event_id: eventId }).select("id", "chassis_id");
  const wanted = new Map(entries.map((e) => [e.chassisId, roundTo(e.expectedUsage, 2)]));
  for (const row of existing) {
    const usage = wanted.get(Number(row.chassis_id));
    if (usage === undefined) await trx("event_entries").where({ id: row.id }).delete();
    else await trx("event_entries").where({ id: row.id }).update({ expected_usage: usage, updated_at: trx.fn.now() });
  }
  const kept = new Set(existing.map((r) => Number(r.chassis_id)));
  const fresh = entries.filter((e) => !kept.has(e.chassisId));
  if (fresh.length) await trx("event_entries").insert(fresh.map((e) => ({ event_id: eventId, chassis_id: e.chassisId, expected_usage: roundTo(e.expectedUsage, 2) })));
}

export async function createEvent(actor: Actor, input: EventInput & { name: string; startsOn: string; endsOn: string; elevationM: number; kind: "practice" | "race" | "test" }): Promise<SeasonEvent> {
  const organisationId = actor.membership.organisationId;
  return db().transaction(async (trx) => {
    if (input.entries) await checkEntries(organisationId, input.entries, trx);
    const [id] = await trx("events").insert({ organisation_id: organisationId, ...toEventColumns(input) });
    if (input.entries?.length) await replaceEntries(trx, Number(id), input.entries);
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: "event.created",
      entity: "event",
      entityId: id,
      details: { name: input.name, startsOn: input.startsOn, entries: input.entries?.length ?? 0 },
    });
    return getEvent(organisationId, Number(id), trx);
  });
}

export async function updateEvent(actor: Actor, eventId: number, input: EventInput): Promise<SeasonEvent> {
  const organisationId = actor.membership.organisationId;
  return db().transaction(async (trx) => {
    const row = await findEventRow(organisationId, eventId, trx, true);
    if (!row) throw notFound(NO_EVENT);
    const problem = checkEventDates(input.startsOn ?? row.starts_on, input.endsOn ?? row.ends_on);
    if (problem) throw badRequest(problem, { [input.endsOn !== undefined ? "endsOn" : "startsOn"]: problem });
    if (input.entries) await checkEntries(organisationId, input.entries, trx);
    const columns = toEventColumns(input);
    if (Object.keys(columns).length) await trx("events").where({ id: eventId }).update({ ...columns, updated_at: trx.fn.now() });
    if (input.entries) await replaceEntries(trx, eventId, input.entries);
    if (Object.keys(input).length) {
      await writeAudit(trx, { organisationId, actorUserId: actor.userId, action: "event.updated", entity: "event", entityId: eventId, details: { fields: Object.keys(input) } });
    }
    return getEvent(organisationId, eventId, trx);
  });
}

/** Events are archived, never deleted: the fuel records and the engines that ran stay readable. */
export async function archiveEvent(actor: Actor, eventId: number): Promise<SeasonEvent> {
  const organisationId = actor.membership.organisationId;
  return db().transaction(async (trx) => {
    const row = await findEventRow(organisationId, eventId, trx, true);
    if (!row) throw notFound(NO_EVENT);
    if (!row.archived_at) {
      await trx("events").where({ id: eventId }).update({ archived_at: actor.now, updated_at: trx.fn.now() });
      await writeAudit(trx, { organisationId, actorUserId: actor.userId, action: "event.archived", entity: "event", entityId: eventId, details: { name: row.name } });
    }
    return getEvent(organisationId, eventId, trx);
  });
}

export async function recordFuelRun(actor: Actor, eventId: number, entryId: number, fuelRun: string): Promise<SeasonEvent> {
  const organisationId = actor.membership.organisationId;
  return db().transaction(async (trx) => {
    const entry = await trx("event_entries as x")
      .join("events as ev", "ev.id", "x.event_id")
      .where({ "ev.organisation_id": organisationId, "x.event_id": eventId, "x.id": entryId })
      .forUpdate()
      .first("x.id", "x.fuel_run");
    if (!entry) throw notFound("No entry with that id in this event.");
    await trx("event_entries").where({ id: entryId }).update({ fuel_run: fuelRun, fuel_decided_by: actor.userId, fuel_decided_at: actor.now, updated_at: trx.fn.now() });
    await writeAudit(trx, { organisationId, actorUserId: actor.userId, action: "entry.fuel_recorded", entity: "event_entry", entityId: entryId, details: { eventId, fuelRun, before: entry.fuel_run } });
    return getEvent(organisationId, eventId, trx);
  });
}

export async function getShop(organisationId: number, now: Date): Promise<{ shop: ShopSettings; closedDays: ClosedDay[] }> {
  const { today } = await findToday(organisationId, now);
  return { shop: await loadShopSettings(organisationId), closedDays: await listClosedDays(organisationId, shiftDay(today, -30)) };
}

export async function updateShop(actor: Actor, settings: Omit<ShopSettings, "isDefault">): Promise<{ shop: ShopSettings; closedDays: ClosedDay[] }> {
  const organisationId = actor.membership.organisationId;
  if (settings.hoursPerWeekday.every((h) => h === 0)) throw badRequest("The shop needs hours on at least one day.", { hoursPerWeekday: "All seven days are zero." });
  await db().transaction(async (trx) => {
    await saveShopSettings(organisationId, settings, trx);
    await writeAudit(trx, { organisationId, actorUserId: actor.userId, action: "shop.updated", entity: "shop_settings", entityId: organisationId, details: { ...settings } });
  });
  return getShop(organisationId, actor.now);
}

export async function addClosedDay(actor: Actor, day: string, reason: string | undefined): Promise<{ shop: ShopSettings; closedDays: ClosedDay[] }> {
  const organisationId = actor.membership.organisationId;
  await db()
    .transaction(async (trx) => {
      const [id] = await trx("shop_closed_days").insert({ organisation_id: organisationId, day, reason: reason || null });
      await writeAudit(trx, { organisationId, actorUserId: actor.userId, action: "shop.day_closed", entity: "shop_closed_day", entityId: id, details: { day, reason } });
    })
    .catch((err) => {
      if (isDuplicateKey(err)) throw conflict("That day is already closed.", { day: "already closed" });
      throw err;
    });
  return getShop(organisationId, actor.now);
}

export async function removeClosedDay(actor: Actor, day: string): Promise<{ shop: ShopSettings; closedDays: ClosedDay[] }> {
  const organisationId = actor.membership.organisationId;
  await db().transaction(async (trx) => {
    const n = await trx("shop_closed_days").where({ organisation_id: organisationId, day }).delete();
    if (n === 0) throw notFound("That day is not closed.");
    await writeAudit(trx, { organisationId, actorUserId: actor.userId, action: "shop.day_opened", entity: "shop_closed_day", entityId: null, details: { day } });
  });
  return getShop(organisationId, actor.now);
}

export interface SeasonOverview {
  today: string;
  nextEvents: SeasonEvent[];
  jobsThisWeek: BenchJob[];
}

/** The next events and the jobs due within a week (overdue planned jobs included). */
export async function loadSeasonOverview(organisationId: number, now: Date): Promise<SeasonOverview> {
  const { today } = await findToday(organisationId, now);
  const nextEvents = await assembleEvents(await listEventRows(organisationId, { from: today, limit: 3 }), db());
  const rows = await listJobRows(organisationId, { states: ["planned", "in_progress"], to: shiftDay(today, 6) });
  return { today, nextEvents, jobsThisWeek: await assembleJobs(rows) };
}
