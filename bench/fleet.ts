/**
 * A throw-away organisation with a large fleet, for the benches: engines (mixed statuses and
 * limits), chassis with engines installed, services, usage rows, reading sets with cylinder
 * readings, open signals, and a season of events with entries and bench jobs. All invented.
 *
 * Rows go in with multi-row inserts in batches. Services go in before usage, so the counter
 * triggers on usage_entries only add each row to an existing counter (a service inserted after
 * the usage would make its trigger recount every usage row of that engine).
 */
import { performance } from "node:perf_hooks";
import type { Knex } from "knex";
import { db } from "../src/db/client.ts";
import { hashPassword } from "../src/server/auth/passwords.ts";
import { newId } from "../src/server/tokens.ts";

export interface FleetOptions {
  engines: number;
  usagePerEngine: number;
  password: string;
  /** Dates are laid out around this day (usage in the year before it, events around it). */
  now: Date;
  /** Open signals, events with entries and this week's bench jobs (the Overview reads them). */
  withSeason?: boolean;
  log?: (line: string) => void;
}

export interface Fleet {
  orgId: number;
  email: string;
  password: string;
  engineIds: number[];
  usageRows: number;
  seconds: number;
}

const STATUSES = ["running", "running", "running", "bench", "spare", "retired"] as const;
const BATCH_ROWS = 5000;
const USAGE_DAYS = 390;

function shiftDay(day: string, days: number): string {
  return new Date(Date.parse(`${day}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
}

async function insertBatched(k: Knex, table: string, rows: Record<string, unknown>[], size = BATCH_ROWS): Promise<void> {
  for (let i = 0; i < rows.length; i += size) await k(table).insert(rows.slice(i, i + size));
}

async function pluckIds(k: Knex, table: string, orgId: number): Promise<number[]> {
  return (await k(table).where({ organisation_id: orgId }).orderBy("id").pluck("id")).map(Number);
}

async function insertOwner(k: Knex, orgId: number, password: string, stamp: string): Promise<{ email: string; userId: string }> {
  const email = `bench-${stamp}@bench.example`;
  const userId = newId();
  await k("users").insert({ id: userId, email, name: "Bench Owner", password_hash: await hashPassword(password), last_org_id: orgId });
  await k("memberships").insert({ organisation_id: orgId, user_id: userId, role: "owner" });
  return { email, userId };
}

async function insertEngines(k: Knex, orgId: number, count: number): Promise<number[]> {
  const engines = Array.from({ length: count }, (_, i) => ({
    organisation_id: orgId,
    name: `E-${String(i + 1).padStart(5, "0")}`,
    serial: `BS-${(i * 7919) % 100000}`,
    cylinders: 1 + (i % 3),
    bore_mm: 72,
    stroke_mm: 73.8,
    rod_mm: 130,
    exhaust_opens_deg_atdc: 82,
    status: STATUSES[i % STATUSES.length],
    top_end_limit: i % 10 === 0 ? null : 8 + (i % 5),
    bottom_end_limit: 24,
  }));
  await insertBatched(k, "engines", engines);
  return pluckIds(k, "engines", orgId);
}

/** One chassis per five engines, each with the first of its five engines installed. */
async function insertChassis(k: Knex, orgId: number, ids: number[], today: string): Promise<{ chassisIds: number[] }> {
  const count = Math.floor(ids.length / 5);
  await insertBatched(k, "chassis", Array.from({ length: count }, (_, i) => ({ organisation_id: orgId, number: String(i + 1), kind: "sled", meter_kind: "none" })));
  const chassisIds = await pluckIds(k, "chassis", orgId);
  const installedAt = new Date(`${shiftDay(today, -30)}T12:00:00Z`);
  await insertBatched(k, "installations", chassisIds.map((c, i) => ({ organisation_id: orgId, engine_id: ids[i * 5], chassis_id: c, installed_at: installedAt })));
  return { chassisIds };
}

async function insertServices(k: Knex, orgId: number, ids: number[], today: string): Promise<void> {
  const rows = ids.flatMap((id, i) => [
    { organisation_id: orgId, engine_id: id, kind: "top_end", done_on: shiftDay(today, -180 + (i % 150)) },
    { organisation_id: orgId, engine_id: id, kind: "bottom_end", done_on: shiftDay(today, -360 + (i % 150)) },
  ]);
  await insertBatched(k, "services", rows);
}

/** `perEngine` rows per engine over the USAGE_DAYS before today, generated batch by batch. */
async function insertUsage(k: Knex, orgId: number, ids: number[], perEngine: number, today: string, log: (line: string) => void): Promise<number> {
  const first = shiftDay(today, -USAGE_DAYS);
  const total = ids.length * perEngine;
  let batch: Record<string, unknown>[] = [];
  let written = 0;
  let reported = 0;
  for (let i = 0; i < ids.length; i += 1) {
    for (let u = 0; u < perEngine; u += 1) {
      batch.push({
        organisation_id: orgId,
        engine_id: ids[i],
        occurred_on: shiftDay(first, (u * 7 + i) % USAGE_DAYS),
        amount: 0.25 + ((u + i) % 6) * 0.25,
        source: u % 4 === 0 ? "import" : "manual",
        session_label: u % 3 === 0 ? "Practice" : "Race",
      });
      if (batch.length === BATCH_ROWS) {
        await k("usage_entries").insert(batch);
        written += batch.length;
        batch = [];
        if (written - reported >= 100_000) {
          log(`usage rows: ${written.toLocaleString("en")} of ${total.toLocaleString("en")}`);
          reported = written;
        }
      }
    }
  }
  if (batch.length) await k("usage_entries").insert(batch);
  return total;
}

async function insertReadings(k: Knex, orgId: number, ids: number[], today: string): Promise<void> {
  const sets = ids.flatMap((id, i) =>
    [-320, -20].map((days) => ({ organisation_id: orgId, engine_id: id, taken_on: shiftDay(today, days + (i % 10)), elevation_m: 366, set_kind: "between_events" })),
  );
  await insertBatched(k, "reading_sets", sets);
  const setRows = await k("reading_sets as s").join("engines as e", "e.id", "s.engine_id").where("s.organisation_id", orgId).select("s.id", "e.cylinders");
  const cylinders: Record<string, unknown>[] = [];
  for (const s of setRows) {
    for (let c = 1; c <= Number(s.cylinders); c += 1) {
      cylinders.push({ reading_set_id: s.id, cylinder_no: c, chamber_readings_cc: JSON.stringify([23.6, 23.7, 23.6]), flat_plate_cc: 26.4, squish_a_mm: 1.2, squish_b_mm: 1.21, cranking_kpa: 1000, leakdown_pct: 4 });
    }
  }
  await insertBatched(k, "cylinder_readings", cylinders);
}

/** One open signal for every tenth engine, events every twelve days with ten chassis each, and bench jobs this week. */
async function insertSeason(k: Knex, orgId: number, ids: number[], chassisIds: number[], now: Date): Promise<void> {
  const today = now.toISOString().slice(0, 10);
  const signals = ids
    .filter((_, i) => i % 10 === 1)
    .map((id, n) => ({
      organisation_id: orgId,
      engine_id: id,
      signal_key: `due-soon:${id}:top_end`,
      kind: "due-soon",
      severity: n % 3 === 0 ? "act" : "watch",
      numbers: JSON.stringify({ share: 0.85 + (n % 10) / 100 }),
      message: "Top end due within the next event.",
      opened_at: new Date(now.getTime() - (n % 50) * 3_600_000),
    }));
  await insertBatched(k, "signals", signals);
  const events = Array.from({ length: 30 }, (_, i) => ({
    organisation_id: orgId,
    name: `Bench round ${i + 1}`,
    venue: "Bench valley",
    starts_on: shiftDay(today, -60 + i * 12),
    ends_on: shiftDay(today, -59 + i * 12),
    elevation_m: 300 + (i % 7) * 250,
    kind: "race",
    important: i % 5 === 0,
  }));
  await insertBatched(k, "events", events);
  const eventIds = await pluckIds(k, "events", orgId);
  const entries = eventIds.flatMap((eventId, e) =>
    Array.from({ length: 10 }, (_, j) => {
      const c = (e * 10 + j) % chassisIds.length;
      return { event_id: eventId, chassis_id: chassisIds[c], expected_usage: 2.5, engine_id: ids[c * 5] };
    }),
  );
  await insertBatched(k, "event_entries", entries);
  const jobs = ids
    .filter((_, i) => i % 100 === 3)
    .map((id, n) => ({
      organisation_id: orgId,
      engine_id: id,
      kind: n % 4 === 0 ? "bottom_end" : "top_end",
      state: "planned",
      starts_on: shiftDay(today, n % 7),
      ends_on: shiftDay(today, n % 7),
      labour_hours_planned: 3.5,
      checklist: JSON.stringify([]),
    }));
  await insertBatched(k, "jobs", jobs);
}

/** Builds the organisation and its fleet; returns the owner's e-mail and the engine ids. */
export async function buildFleet(opts: FleetOptions, k: Knex = db()): Promise<Fleet> {
  const log = opts.log ?? ((): void => undefined);
  const started = performance.now();
  const today = opts.now.toISOString().slice(0, 10);
  const stamp = `${opts.now.getTime().toString(36)}${Math.floor(Math.random() * 1e6).toString(36)}`;
  const [orgId] = await k("organisations").insert({ name: `Fleet bench ${stamp}`, slug: `bench-fleet-${stamp}`, usage_unit: "hours", shop_elevation_m: 366 });
  const { email } = await insertOwner(k, Number(orgId), opts.password, stamp);
  const engineIds = await insertEngines(k, Number(orgId), opts.engines);
  const { chassisIds } = await insertChassis(k, Number(orgId), engineIds, today);
  await insertServices(k, Number(orgId), engineIds, today);
  log(`${engineIds.length.toLocaleString("en")} engines, ${chassisIds.length.toLocaleString("en")} chassis and their services written`);
  const usageRows = await insertUsage(k, Number(orgId), engineIds, opts.usagePerEngine, today, log);
  await insertReadings(k, Number(orgId), engineIds, today);
  if (opts.withSeason) await insertSeason(k, Number(orgId), engineIds, chassisIds, opts.now);
  await k.raw("ANALYZE TABLE engines, engine_counters, usage_entries, services, reading_sets, cylinder_readings, installations, signals, events, jobs");
  return { orgId: Number(orgId), email, password: opts.password, engineIds, usageRows, seconds: (performance.now() - started) / 1000 };
}

/** Deletes the organisation (its rows cascade) and its owner. */
export async function removeFleet(fleet: Fleet, k: Knex = db()): Promise<void> {
  await k("users").where({ email: fleet.email }).delete();
  await k("organisations").where({ id: fleet.orgId }).delete();
}
