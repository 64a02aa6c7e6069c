/**
 * `npm run bench [bench/<name>.ts …] [--flag=value …]`: speed and capacity figures, never part of
 * `npm test`. Always runs the rebuild planner bench (bench/planner-bench.ts: generated fleets, no
 * database), then every other bench file named on the command line, one after another, each
 * printing its own table. Flags go to the named benches (e.g. --engines=5000 for the roster).
 * Benches that need a database read the usual DB_* variables, as `npm start` sets them.
 */
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { join, relative, resolve } from "node:path";

const ROOT = resolve(import.meta.dirname, "..");
const PLANNER_BENCH = "bench/planner-bench.ts";

function runBench(file: string, flags: string[]): number {
  const started = Date.now();
  process.stdout.write(`\nringland bench: ${file}\n\n`);
  const r = spawnSync(process.execPath, ["--import", "tsx", join(ROOT, file), ...flags], { cwd: ROOT, stdio: "inherit", env: process.env });
  const code = r.status ?? (r.signal ? 1 : 0);
  process.stdout.write(`\nringland bench: ${file} ${code === 0 ? "finished" : `failed (exit ${code})`} in ${((Date.now() - started) / 1000).toFixed(1)} s\n`);
  return code;
}

function main(): number {
  const args = process.argv.slice(2);
  const flags = args.filter((a) => a.startsWith("--"));
  const named = args.filter((a) => !a.startsWith("--")).map((a) => relative(ROOT, resolve(ROOT, a)));
  const missing = named.filter((f) => !existsSync(join(ROOT, f)) || !f.endsWith(".ts"));
  if (missing.length) {
    console.error(`ringland bench: no such bench file: ${missing.join(", ")} (bench files live in bench/ and end in .ts)`);
    return 2;
  }
  let failed = 0;
  if (existsSync(join(ROOT, PLANNER_BENCH))) {
    if (runBench(PLANNER_BENCH, []) !== 0) failed += 1;
  } else {
    process.stdout.write(`ringland bench: ${PLANNER_BENCH} is not there yet; skipping the planner bench.\n`);
  }
  for (const file of named.filter((f) => f !== PLANNER_BENCH)) {
    if (runBench(file, flags) !== 0) failed += 1;
  }
  return failed === 0 ? 0 : 1;
}

process.exit(main());
