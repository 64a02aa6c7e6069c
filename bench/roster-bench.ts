/**
 * The Motors roster with a fleet of 5,000 engines: how long the roster takes to answer.
 *
 *   node --import tsx bench/roster-bench.ts [--engines=5000] [--usage=40] [--runs=20] [--keep]
 *
 * Needs a migrated database given by the usual DB_* variables (`npm run bench
 * bench/roster-bench.ts` starts a private one and sets them). It creates a throw-away
 * organisation with the fleet (bench/fleet.ts: usage, services, readings, installations), times
 * the roster service for the shapes the Motors page asks for, and, when RINGLAND_BASE_URL points
 * at a running server on the same database, the HTTP route as well.
 * Prints a markdown table, then deletes the organisation (unless --keep).
 */
import { performance } from "node:perf_hooks";
import { closeDb } from "../src/db/client.ts";
import { buildFleet, removeFleet, type Fleet } from "./fleet.ts";
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

async function buildRosterFleet(): Promise<Fleet> {
  return buildFleet({ engines: ENGINES, usagePerEngine: USAGE_PER_ENGINE, password: PASSWORD, now: new Date() });
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
  ["search", "search=E-0001"],
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
  const fleet = await buildRosterFleet();
  try {
    const usageRows = fleet.usageRows;
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
    if (!KEEP) await removeFleet(fleet);
    await closeDb();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
