/**
 * `npm run bench [bench/<name>.ts …] [--flag=value …]`: speed and capacity figures, never part of
 * `npm test`.
 *
 * 1. The rebuild planner bench (bench/planner-bench.ts: generated fleets, no database).
 * 2. A private stack, as `npm test` starts it: a fresh MariaDB in a temporary folder, the fakes,
 *    migrations, the demo seed, a build (RINGLAND_BUILD_DIR or dist/) served on a free port, and
 *    the floor server (bench/floor-server.ts) on another, all on 127.0.0.1.
 * 3. The Speed bench (bench/load-bench.ts): fleet, autocannon, JavaScript per page; it writes
 *    docs/quality.md under "## Speed".
 * 4. Every other bench file named on the command line (by default bench/roster-bench.ts and
 *    bench/signals-bench.ts), against the same stack (DB_* and RINGLAND_BASE_URL set), each
 *    printing its own table.
 *
 * Flags: --no-load skips 2 and 3 (a stack is still started for named benches); --seconds=N,
 * --connections=10,50 and --no-write go to the Speed bench only, --engines=N and --usage=N to it
 * and to the named benches, other flags to the named benches. Every step has a time limit; the
 * whole run stops after RUN_LIMIT_MS.
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative, resolve } from "node:path";
import { SERVER_ENTRY, buildIfStale, childEnv, log, migrate, ROOT, seed, startBackingServices, type Stack } from "./lib/stack.ts";
import { freePort, httpOk, startChild, waitFor } from "./lib/processes.ts";

const PLANNER_BENCH = "bench/planner-bench.ts";
const LOAD_BENCH = "bench/load-bench.ts";
/** Run after the Speed bench when no bench file is named: the roster and the signal check at fleet size. */
const DEFAULT_BENCHES = ["bench/roster-bench.ts", "bench/signals-bench.ts"];
const FLOOR_SERVER = "bench/floor-server.ts";
const LOAD_FLAGS = ["--seconds=", "--connections=", "--engines=", "--usage=", "--no-write"];
const BENCH_LIMIT_MS = 20 * 60_000;
const RUN_LIMIT_MS = 40 * 60_000;

function runBench(file: string, flags: string[], env: NodeJS.ProcessEnv): number {
  const started = Date.now();
  process.stdout.write(`\nringland bench: ${file}\n\n`);
  const r = spawnSync(process.execPath, ["--import", "tsx", join(ROOT, file), ...flags], {
    cwd: ROOT,
    stdio: "inherit",
    env,
    timeout: BENCH_LIMIT_MS,
    killSignal: "SIGKILL",
  });
  const code = r.error ? 1 : (r.status ?? (r.signal ? 1 : 0));
  const why = r.error ? ` (${r.error.message})` : r.signal ? ` (stopped by ${r.signal})` : "";
  process.stdout.write(`\nringland bench: ${file} ${code === 0 ? "finished" : `failed (exit ${code})${why}`} in ${((Date.now() - started) / 1000).toFixed(1)} s\n`);
  return code;
}

/** The private stack with the built app and the floor server; the environment benches run in. */
async function startBenchStack(work: string, stackRef: { stack: Stack | null }): Promise<NodeJS.ProcessEnv> {
  const cfg = {
    dataDir: work,
    dbPort: await freePort(),
    dbName: "ringland_bench",
    dbUser: "ringland_bench",
    dbPassword: "ringland-bench-password",
    smtpPort: await freePort(),
    mailInboxPort: await freePort(),
    s3Port: await freePort(),
    webPort: await freePort(),
    quiet: true,
  };
  const stack = await startBackingServices(cfg);
  stackRef.stack = stack;
  migrate(stack.env);
  seed(stack.env);
  buildIfStale(stack.env);
  const serverEnv = childEnv(cfg, "production");
  const web = startChild("web", [SERVER_ENTRY], serverEnv, { cwd: ROOT });
  stack.children.push(web);
  await waitFor("web server", () => httpOk(`http://127.0.0.1:${cfg.webPort}/api/health`), web);
  const floorPort = await freePort();
  const floor = startChild("floor", ["--import", "tsx", FLOOR_SERVER], { ...serverEnv, PORT: String(floorPort) }, { cwd: ROOT });
  stack.children.push(floor);
  await waitFor("floor server", () => httpOk(`http://127.0.0.1:${floorPort}/health`), floor);
  log(`app server on 127.0.0.1:${cfg.webPort}, floor server on 127.0.0.1:${floorPort}`);
  return {
    ...stack.env,
    NODE_ENV: "production",
    RINGLAND_BASE_URL: `http://127.0.0.1:${cfg.webPort}`,
    RINGLAND_FLOOR_URL: `http://127.0.0.1:${floorPort}`,
  };
}

async function main(): Promise<number> {
  const args = process.argv.slice(2);
  const flags = args.filter((a) => a.startsWith("--"));
  const loadFlags = flags.filter((f) => LOAD_FLAGS.some((p) => f.startsWith(p)));
  // --engines and --usage mean the same to the roster bench, so named benches get them too.
  const otherFlags = flags.filter((f) => f !== "--no-load" && !["--seconds=", "--connections=", "--no-write"].some((p) => f.startsWith(p)));
  const withLoad = !flags.includes("--no-load");
  const given = args.filter((a) => !a.startsWith("--"));
  const named = (given.length ? given : withLoad ? DEFAULT_BENCHES : [])
    .map((a) => relative(ROOT, resolve(ROOT, a)))
    .filter((f) => f !== PLANNER_BENCH && f !== LOAD_BENCH);
  const missing = named.filter((f) => !existsSync(join(ROOT, f)) || !f.endsWith(".ts"));
  if (missing.length) {
    console.error(`ringland bench: no such bench file: ${missing.join(", ")} (bench files live in bench/ and end in .ts)`);
    return 2;
  }

  let failed = 0;
  if (existsSync(join(ROOT, PLANNER_BENCH))) {
    if (runBench(PLANNER_BENCH, [], process.env) !== 0) failed += 1;
  } else {
    process.stdout.write(`ringland bench: ${PLANNER_BENCH} is not there yet; skipping the planner bench.\n`);
  }
  if (!withLoad && named.length === 0) return failed === 0 ? 0 : 1;

  const work = mkdtempSync(join(tmpdir(), "ringland-bench-"));
  const ref: { stack: Stack | null } = { stack: null };
  const stopEverything = async (): Promise<void> => {
    await ref.stack?.stopAll();
    ref.stack = null;
    rmSync(work, { recursive: true, force: true });
  };
  const limit = setTimeout(() => {
    console.error(`ringland bench: stopped after ${RUN_LIMIT_MS / 60_000} minutes`);
    void stopEverything().finally(() => process.exit(1));
  }, RUN_LIMIT_MS);
  for (const signal of ["SIGINT", "SIGTERM"] as const) {
    process.once(signal, () => void stopEverything().finally(() => process.exit(130)));
  }
  try {
    const env = await startBenchStack(work, ref);
    const command = ["npm run bench", ...(args.length ? ["--", ...args] : [])].join(" ");
    if (withLoad && runBench(LOAD_BENCH, loadFlags, { ...env, RINGLAND_BENCH_COMMAND: command }) !== 0) failed += 1;
    for (const file of named) {
      if (runBench(file, otherFlags, env) !== 0) failed += 1;
    }
  } catch (err) {
    console.error(`ringland bench: ${(err as Error).message}`);
    failed += 1;
  } finally {
    clearTimeout(limit);
    await stopEverything();
  }
  return failed === 0 ? 0 : 1;
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
