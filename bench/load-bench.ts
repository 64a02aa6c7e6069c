/**
 * The Speed bench: a fleet of 5,000 engines and 500,000 usage rows, then autocannon against the
 * built server (Overview page, Motors roster API, engine file API) and the floor server at 10
 * and 50 connections, then the JavaScript each page sends. Prints markdown tables and writes
 * them to docs/quality.md under "## Speed". Exits 0 when it measured, whatever the figures.
 *
 * Started by `npm run bench` (scripts/bench.ts), which brings up a private MariaDB, the built
 * server and bench/floor-server.ts and passes DB_*, RINGLAND_BASE_URL and RINGLAND_FLOOR_URL.
 * Flags: --engines=5000 --usage=100 (rows per engine) --seconds=10 --connections=10,50 --no-write
 */
import { cpus, totalmem } from "node:os";
import { join } from "node:path";
import { closeDb, db } from "../src/db/client.ts";
import { DIST, ROOT } from "../scripts/lib/stack.ts";
import { buildRouteTable } from "../scripts/lib/route-table.ts";
import { TIMELINE_PAGE } from "../src/server/services/motors-ui-pages-service.ts";
import { buildFleet, type Fleet } from "./fleet.ts";
import { measureLoad, measureLoadAlternating, type LoadResult, type LoadTarget } from "./http-load.ts";
import { measurePageWeights, type PageToWeigh } from "./page-weight.ts";
import { checkTargets, renderSpeed, writeSpeedSection, type SpeedRun } from "./speed-report.ts";

const flag = (name: string, fallback: string): string => process.argv.find((a) => a.startsWith(`--${name}=`))?.split("=")[1] ?? fallback;
const ENGINES = Number(flag("engines", "5000"));
const USAGE_PER_ENGINE = Number(flag("usage", "100"));
const SECONDS = Number(flag("seconds", "10"));
const CONNECTIONS = flag("connections", "10,50").split(",").map(Number);
const WARM_UP_SECONDS = 2;
/** The roster and its floor are measured in alternating slices of SECONDS / FLOOR_SLICES. */
const FLOOR_SLICES = 5;
const PASSWORD = "bench-fleet-password";
const ROSTER_PATH = "/api/v1/engines?perPage=50&sort=-sinceTopEnd";

const log = (line: string): void => {
  process.stdout.write(`bench: ${line}\n`);
};

function requireEnv(name: string): string {
  const v = process.env[name];
  if (!v) throw new Error(`${name} is not set: run this through \`npm run bench\`, which starts the servers.`);
  return v;
}

async function signIn(baseUrl: string, fleet: Fleet): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: new URL(baseUrl).origin },
    body: JSON.stringify({ email: fleet.email, password: fleet.password }),
    signal: AbortSignal.timeout(30_000),
  });
  if (res.status !== 200) throw new Error(`bench sign-in failed: ${res.status} ${await res.text()}`);
  return res.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
}

function buildTargets(baseUrl: string, floorUrl: string, cookie: string, engineIds: number[]): { targets: LoadTarget[]; paths: Record<string, string> } {
  const headers = { cookie };
  const anyEngine = (): number => engineIds[Math.floor(Math.random() * engineIds.length)];
  const targets: LoadTarget[] = [
    { name: "Overview page", baseUrl, path: "/", headers },
    { name: "Roster API", baseUrl, path: ROSTER_PATH, headers },
    { name: "Floor roster", baseUrl: floorUrl, path: ROSTER_PATH, headers },
    { name: "Engine file API", baseUrl, path: () => `/api/v1/engines/${anyEngine()}`, headers },
    { name: "Engine timeline API", baseUrl, path: () => `/api/v1/engines/${anyEngine()}/timeline?page=1&limit=${TIMELINE_PAGE}`, headers },
    { name: "Engine counters API", baseUrl, path: () => `/api/v1/engines/${anyEngine()}/counters`, headers },
    { name: "Floor, no query", baseUrl: floorUrl, path: "/health", headers },
  ];
  const paths: Record<string, string> = {
    "Overview page": "/",
    "Roster API": ROSTER_PATH,
    "Floor roster": `${ROSTER_PATH} (floor server)`,
    "Engine file API": "/api/v1/engines/<random id>",
    "Engine timeline API": `/api/v1/engines/<random id>/timeline?page=1&limit=${TIMELINE_PAGE}`,
    "Engine counters API": "/api/v1/engines/<random id>/counters",
    "Floor, no query": "/health (floor server: what HTTP alone costs on this machine)",
  };
  return { targets, paths };
}

/** Each target answers 200 once before it is loaded, so a broken route fails loudly, not as a figure. */
async function checkTargetsAnswer(targets: LoadTarget[]): Promise<void> {
  for (const t of targets) {
    const path = typeof t.path === "string" ? t.path : t.path();
    const res = await fetch(t.baseUrl + path, { headers: t.headers, redirect: "manual", signal: AbortSignal.timeout(30_000) });
    await res.arrayBuffer();
    if (res.status !== 200) throw new Error(`${t.name} answered ${res.status} for ${path}`);
  }
}

async function runLoads(targets: LoadTarget[]): Promise<LoadResult[]> {
  const out: LoadResult[] = [];
  const roster = targets.find((t) => t.name === "Roster API")!;
  const floor = targets.find((t) => t.name === "Floor roster")!;
  for (const connections of CONNECTIONS) {
    for (const t of targets) {
      if (t === floor) continue;
      await measureLoad(t, Math.min(connections, 10), WARM_UP_SECONDS);
      if (t === roster) await measureLoad(floor, Math.min(connections, 10), WARM_UP_SECONDS);
      const results = t === roster ? await measureLoadAlternating([roster, floor], connections, SECONDS, FLOOR_SLICES) : [await measureLoad(t, connections, SECONDS)];
      for (const r of results) {
        log(`${r.name} at ${connections} connections: ${Math.round(r.requestsPerSecond)} req/s, p99 ${r.p99Ms.toFixed(1)} ms, errors ${r.errors}, non-2xx ${r.non2xx}`);
        out.push(r);
      }
    }
  }
  return out;
}

function listPages(baseUrl: string, cookie: string, engineId: number): PageToWeigh[] {
  return buildRouteTable(ROOT)
    .filter((r) => r.method === "PAGE")
    .map((r) => {
      const path = r.path.replace(/\[id\]/g, String(engineId)).replace(/\[token\]/g, "bench-no-such-token");
      return { label: r.path, url: baseUrl + path, cookie: r.access === "public" ? undefined : cookie };
    });
}

async function describeMachine(): Promise<string> {
  const [rows] = (await db().raw("SELECT VERSION() AS v")) as [{ v: string }[]];
  const cpu = cpus();
  return (
    `${cpu.length} × ${cpu[0]?.model.trim() ?? "unknown CPU"}, ${Math.round(totalmem() / 2 ** 30)} GB memory, Node ${process.version}, ` +
    `MariaDB ${rows[0].v}. autocannon, the app server (one process, NODE_ENV=production, pool of ${process.env.DB_POOL_MAX ?? 10} connections), ` +
    `the floor server (same pool size) and MariaDB all run on these cores, over 127.0.0.1.`
  );
}

async function main(): Promise<void> {
  const baseUrl = requireEnv("RINGLAND_BASE_URL");
  const floorUrl = requireEnv("RINGLAND_FLOOR_URL");
  const startedAt = new Date();
  log(`building a fleet of ${ENGINES.toLocaleString("en")} engines with ${(ENGINES * USAGE_PER_ENGINE).toLocaleString("en")} usage rows…`);
  const fleet = await buildFleet({ engines: ENGINES, usagePerEngine: USAGE_PER_ENGINE, password: PASSWORD, now: startedAt, withSeason: true, log });
  log(`fleet built in ${fleet.seconds.toFixed(1)} s`);
  const cookie = await signIn(baseUrl, fleet);
  const { targets, paths } = buildTargets(baseUrl, floorUrl, cookie, fleet.engineIds);
  await checkTargetsAnswer(targets);
  const loads = await runLoads(targets);
  log("weighing the JavaScript of every page…");
  const pages = await measurePageWeights(listPages(baseUrl, cookie, fleet.engineIds[0]), join(DIST, "client"));
  for (const p of pages.filter((x) => x.missing.length)) log(`${p.label}: scripts not found in the build: ${p.missing.join(", ")}`);

  const run: SpeedRun = {
    command: process.env.RINGLAND_BENCH_COMMAND ?? "npm run bench",
    startedAt,
    machine: await describeMachine(),
    fleet:
      `one organisation with ${ENGINES.toLocaleString("en")} engines (1,000 in chassis), ${fleet.usageRows.toLocaleString("en")} usage rows, ` +
      `${(ENGINES * 2).toLocaleString("en")} services and ${(ENGINES * 2).toLocaleString("en")} reading sets, 500 open signals, 30 events, bench jobs; ` +
      `built with multi-row inserts in ${fleet.seconds.toFixed(0)} s (bench/fleet.ts). Requests carry its owner's session cookie. ` +
      `Each run lasts ${SECONDS} s after a ${WARM_UP_SECONDS} s warm-up at up to 10 connections; the roster and its floor run in ${FLOOR_SLICES} alternating slices ` +
      `of ${SECONDS / FLOOR_SLICES} s each, so a change in the machine's other load falls on both; engine ids are drawn at random for every request.`,
    loads,
    floorPairs: CONNECTIONS.map((connections) => ({
      connections,
      ringland: loads.find((l) => l.name === "Roster API" && l.connections === connections)!,
      floor: loads.find((l) => l.name === "Floor roster" && l.connections === connections)!,
    })),
    pages,
    overviewLabel: "/",
    seasonLabel: "/season",
    paths,
  };
  const markdown = renderSpeed(run);
  process.stdout.write(`\n## Speed\n\n${markdown}\n\n`);
  if (!process.argv.includes("--no-write")) {
    writeSpeedSection(join(ROOT, "docs", "quality.md"), markdown);
    log("figures written to docs/quality.md under \"## Speed\"");
  }
  const checks = checkTargets(run);
  const missed = checks.filter((c) => !c.met);
  log(missed.length === 0 ? `all ${checks.length} targets met` : `${checks.length - missed.length} of ${checks.length} targets met; missed:\n${missed.map((m) => `  - ${m.text}`).join("\n")}`);
}

main()
  .then(() => closeDb())
  .then(
    () => process.exit(0),
    (err) => {
      console.error(err);
      void closeDb().finally(() => process.exit(1));
    },
  );
