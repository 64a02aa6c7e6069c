/**
 * The signal check for a large fleet: 10,000 engines with 20 reading sets each (invented), one
 * organisation, timed from loading to the committed transaction with its queued mail.
 *
 *   node --import tsx bench/signals-bench.ts [--engines=10000] [--sets=20] [--keep]
 *
 * Needs a migrated database given by the usual DB_* variables (`npm run bench` starts one).
 * Prints a markdown table, then deletes the organisation (unless --keep).
 */
import { performance } from "node:perf_hooks";
import type { Knex } from "knex";
import { closeDb, db } from "../src/db/client.ts";
import { runSignalCheck } from "../src/server/signals/check.ts";
import { loadEngineSignalInputs } from "../src/server/signals/engine-inputs.ts";
import { buildFleet, removeFleet } from "./fleet.ts";

const arg = (name: string, fallback: number): number => {
  const hit = process.argv.find((a) => a.startsWith(`--${name}=`));
  return hit ? Number(hit.split("=")[1]) : fallback;
};
const ENGINES = arg("engines", 10_000);
const SETS = arg("sets", 20);
const KEEP = process.argv.includes("--keep");

function day(base: string, offset: number): string {
  return new Date(Date.parse(`${base}T00:00:00Z`) + offset * 86_400_000).toISOString().slice(0, 10);
}

/** SETS reading sets per engine: a baseline, then sets a week apart; every 25th engine carbons up. */
async function insertReadingHistory(k: Knex, orgId: number, engineIds: number[], today: string): Promise<number> {
  await k("reading_sets").where({ organisation_id: orgId }).delete(); // the fleet's own two sets go
  const engines = await k("engines").where({ organisation_id: orgId }).select("id", "cylinders");
  const cylindersOf = new Map(engines.map((e) => [Number(e.id), Number(e.cylinders)]));
  let written = 0;
  for (let i = 0; i < engineIds.length; i += 500) {
    const chunk = engineIds.slice(i, i + 500);
    const sets = chunk.flatMap((id) =>
      Array.from({ length: SETS }, (_, n) => ({
        organisation_id: orgId,
        engine_id: id,
        taken_on: day(today, -7 * (SETS - n)),
        elevation_m: 366,
        is_baseline: n === 0,
        set_kind: n === 0 ? "build" : "between_events",
      })),
    );
    await k("reading_sets").insert(sets);
    const rows = await k("reading_sets").whereIn("engine_id", chunk).select("id", "engine_id", "taken_on", "is_baseline").orderBy(["engine_id", "taken_on"]);
    const cylinders: Record<string, unknown>[] = [];
    const step = new Map<number, number>();
    for (const r of rows) {
      const engineId = Number(r.engine_id);
      const n = step.get(engineId) ?? 0;
      step.set(engineId, n + 1);
      const drifting = engineId % 25 === 0;
      for (let c = 1; c <= (cylindersOf.get(engineId) ?? 1); c += 1) {
        const cc = Math.round((23.6 - (drifting && c === 1 ? 0.04 * n : 0)) * 10) / 10;
        cylinders.push({ reading_set_id: r.id, cylinder_no: c, chamber_readings_cc: JSON.stringify([cc, cc]), squish_a_mm: 1.2, squish_b_mm: 1.21, cranking_kpa: 1000, leakdown_pct: 4 });
      }
    }
    for (let j = 0; j < cylinders.length; j += 5000) await k("cylinder_readings").insert(cylinders.slice(j, j + 5000));
    written += sets.length;
  }
  return written;
}

async function main(): Promise<void> {
  const k = db();
  const now = new Date();
  const today = now.toISOString().slice(0, 10);
  const built = performance.now();
  const fleet = await buildFleet({ engines: ENGINES, usagePerEngine: 5, password: "bench-signals-password", now });
  const sets = await insertReadingHistory(k, fleet.orgId, fleet.engineIds, today);
  const setupS = (performance.now() - built) / 1000;
  try {
    const rows: string[] = [];
    for (const [label, opts] of [["first check (opens every signal, queues mail)", {}], ["second check (nothing new)", {}], ["scheduled check with digests", { digest: true }]] as const) {
      const t0 = performance.now();
      const r = await runSignalCheck(k, fleet.orgId, now, loadEngineSignalInputs, opts);
      const ms = performance.now() - t0;
      rows.push(`| ${label} | ${r.engines.toLocaleString("en")} | ${(ms / 1000).toFixed(2)} s | ${r.opened} | ${r.autoResolved} | ${r.mailsQueued} | ${r.skipped.length} |`);
    }
    const memMb = process.memoryUsage().rss / 1e6;
    console.log(`\n### Signal check: ${ENGINES.toLocaleString("en")} engines × ${SETS} reading sets (${sets.toLocaleString("en")} sets; fleet written in ${setupS.toFixed(0)} s)\n`);
    console.log("| run | engines | time | opened | cleared | mails queued | engines skipped |");
    console.log("| --- | ---: | ---: | ---: | ---: | ---: | ---: |");
    for (const r of rows) console.log(r);
    console.log(`\nResident memory of the process after the runs: ${memMb.toFixed(0)} MB.`);
  } finally {
    if (!KEEP) await removeFleet(fleet, k);
    await closeDb();
  }
}

main().catch(async (err) => {
  console.error(err);
  await closeDb();
  process.exit(1);
});
