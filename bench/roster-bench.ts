/**
 * The Motors roster with a fleet of 5,000 engines: how long the roster takes to answer.
 *
 *   node --import tsx bench/roster-bench.ts [--engines=5000] [--usage=40] [--runs=20] [--keep]
 *
 * Needs a migrated database given by the usual DB_* variables (as `npm start` or `npm test`
 * set them). It creates a throw-away organisation with the fleet (usage, services, readings,
 * installations), times the roster service for the shapes the Motors page asks for, and, when
 * RINGLAND_BASE_URL points at a running server on the same database, the HTTP route as well.
 * Prints a markdown table, then deletes the organisation (unless --keep).
 */
import { performance } from "node:perf_hooks";
import { closeDb, db } from "../src/db/client.ts";
import { hashPassword } from "../src/server/auth/passwords.ts";
import { newId } from "../src/server/tokens.ts";
import { listRoster } from "../src/server/services/roster-service.ts";
import { engineListQuerySchema } from "../src/lib/schemas/motors.ts";

const arg = (name: string, fallback: number): number => {
  const hit = process.argv.find((a) => a.startsWith(`--${name}=`));
  return hit ? Number(hit.split("=")[1]) : fallback;
};
const ENGINES = arg("engines", 5000);
const USAGE_PER_ENGINE = arg("usage", 40);
const RUNS = arg("runs", 20);
const KEEP = process.argv.includes("--keep");
const PASSWORD = "bench-roster-password";

const STATUSES = ["running", "running", "running", "bench", "spare", "retired"] as const;

async function insertBatched(table: string, rows: Record<string, unknown>[], size = 2000): Promise<void> {
  for (let i = 0; i < rows.length; i += size) await db()(table).insert(rows.slice(i, i + size));
}

function dayOffset(base: string, days: number): string {
  return new Date(Date.parse(`${base}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
}

async function buildFleet(): Promise<{ orgId: number; email: string; seconds: number }> {
  const started = performance.now();
  const stamp = Date.now().toString(36);
  const [orgId] = await db()("organisations").insert({ name: `Roster bench ${stamp}`, slug: `bench-roster-${stamp}`, usage_unit: "hours", shop_elevation_m: 366 });
  const email = `bench-${stamp}@bench.example`;
  const userId = newId();
  await db()("users").insert({ id: userId, email, name: "Bench Owner", password_hash: await hashPassword(PASSWORD), last_org_id: orgId });
  await db()("memberships").insert({ organisation_id: orgId, user_id: userId, role: "owner" });

  const engines = Array.from({ length: ENGINES }, (_, i) => ({
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
  await insertBatched("engines", engines);
  const ids: number[] = (await db()("engines").where({ organisation_id: orgId }).orderBy("id").pluck("id")).map(Number);

  const chassisCount = Math.floor(ENGINES / 5);
  await insertBatched("chassis", Array.from({ length: chassisCount }, (_, i) => ({ organisation_id: orgId, number: String(i + 1), kind: "sled", meter_kind: "none" })));
  const chassisIds: number[] = (await db()("chassis").where({ organisation_id: orgId }).orderBy("id").pluck("id")).map(Number);
  await insertBatched("installations", chassisIds.map((c, i) => ({ organisation_id: orgId, engine_id: ids[i * 5], chassis_id: c, installed_at: new Date("2026-11-01T12:00:00Z") })));

  const usage: Record<string, unknown>[] = [];
  const services: Record<string, unknown>[] = [];
  const sets: Record<string, unknown>[] = [];
  ids.forEach((id, i) => {
    for (let u = 0; u < USAGE_PER_ENGINE; u += 1) {
      usage.push({ organisation_id: orgId, engine_id: id, occurred_on: dayOffset("2025-11-01", (u * 9 + i) % 390), amount: 0.25 + ((u + i) % 6) * 0.25, source: "manual" });
    }
    services.push({ organisation_id: orgId, engine_id: id, kind: "top_end", done_on: dayOffset("2026-06-01", i % 150) });
    services.push({ organisation_id: orgId, engine_id: id, kind: "bottom_end", done_on: dayOffset("2025-06-01", i % 150) });
    for (const takenOn of ["2026-01-10", "2026-11-20"]) sets.push({ organisation_id: orgId, engine_id: id, taken_on: takenOn, elevation_m: 366, set_kind: "between_events" });
  });
  await insertBatched("usage_entries", usage);
  await insertBatched("services", services);
  await insertBatched("reading_sets", sets);
  const setRows = await db()("reading_sets as s").join("engines as e", "e.id", "s.engine_id").where("s.organisation_id", orgId).select("s.id", "e.cylinders");
  const cylinders: Record<string, unknown>[] = [];
  for (const s of setRows) {
    for (let c = 1; c <= Number(s.cylinders); c += 1) {
      cylinders.push({ reading_set_id: s.id, cylinder_no: c, chamber_readings_cc: JSON.stringify([23.6, 23.7, 23.6]), flat_plate_cc: 26.4, squish_a_mm: 1.2, squish_b_mm: 1.21, cranking_kpa: 1000, leakdown_pct: 4 });
    }
  }
  await insertBatched("cylinder_readings", cylinders);
  await db().raw("ANALYZE TABLE engines, usage_entries, services, reading_sets, installations");
  return { orgId: Number(orgId), email, seconds: (performance.now() - started) / 1000 };
}

interface Row {
  shape: string;
  query: string;
  median: number;
  p95: number;
  rows: number;
}

function summarize(times: number[]): { median: number; p95: number } {
  const sorted = [...times].sort((a, b) => a - b);
  return { median: sorted[Math.floor(sorted.length / 2)], p95: sorted[Math.min(sorted.length - 1, Math.ceil(sorted.length * 0.95) - 1)] };
}

const SHAPES: [string, string][] = [
  ["first page, by name", ""],
  ["by usage since top end", "sort=-sinceTopEnd"],
  ["by share of the top-end limit, page 20", "sort=-topEndShare&page=20"],
  ["running only, by chassis", "status=running&sort=chassis"],
  ["search", "search=E-012"],
  ["200 per page", "perPage=200"],
];

async function timeService(orgId: number): Promise<Row[]> {
  const out: Row[] = [];
  for (const [shape, qs] of SHAPES) {
    const query = engineListQuerySchema.parse(Object.fromEntries(new URLSearchParams(qs)));
    await listRoster(orgId, "hours", query);
    const times: number[] = [];
    let rows = 0;
    for (let i = 0; i < RUNS; i += 1) {
      const t = performance.now();
      rows = (await listRoster(orgId, "hours", query)).engines.length;
      times.push(performance.now() - t);
    }
    out.push({ shape, query: qs || "(none)", rows, ...summarize(times) });
  }
  return out;
}

async function timeHttp(baseUrl: string, email: string): Promise<Row[]> {
  const signIn = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: new URL(baseUrl).origin },
    body: JSON.stringify({ email, password: PASSWORD }),
  });
  if (signIn.status !== 200) throw new Error(`bench sign-in failed: ${signIn.status}`);
  const cookie = signIn.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
  const out: Row[] = [];
  for (const [shape, qs] of SHAPES) {
    const url = `${baseUrl}/api/v1/engines${qs ? `?${qs}` : ""}`;
    await fetch(url, { headers: { cookie } }).then((r) => r.arrayBuffer());
    const times: number[] = [];
    let rows = 0;
    for (let i = 0; i < RUNS; i += 1) {
      const t = performance.now();
      const res = await fetch(url, { headers: { cookie } });
      const body = (await res.json()) as { engines?: unknown[] };
      times.push(performance.now() - t);
      if (res.status !== 200) throw new Error(`roster answered ${res.status}`);
      rows = body.engines?.length ?? 0;
    }
    out.push({ shape: `HTTP: ${shape}`, query: qs || "(none)", rows, ...summarize(times) });
  }
  return out;
}

async function main(): Promise<void> {
  const fleet = await buildFleet();
  try {
    const usageRows = ENGINES * USAGE_PER_ENGINE;
    const rows = await timeService(fleet.orgId);
    const base = process.env.RINGLAND_BASE_URL;
    if (base) rows.push(...(await timeHttp(base, fleet.email)));
    console.log(`\n### Motors roster, ${ENGINES.toLocaleString("en")} engines, ${usageRows.toLocaleString("en")} usage entries, ${RUNS} runs each\n`);
    console.log(`Fleet built in ${fleet.seconds.toFixed(1)} s.\n`);
    console.log("| shape | query | engines returned | median ms | p95 ms |");
    console.log("| --- | --- | ---: | ---: | ---: |");
    for (const r of rows) console.log(`| ${r.shape} | \`${r.query}\` | ${r.rows} | ${r.median.toFixed(1)} | ${r.p95.toFixed(1)} |`);
    if (!base) console.log("\n(Set RINGLAND_BASE_URL to a running server on this database to time the HTTP route too.)");
  } finally {
    if (!KEEP) {
      await db()("users").where({ email: fleet.email }).delete();
      await db()("organisations").where({ id: fleet.orgId }).delete();
    }
    await closeDb();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
