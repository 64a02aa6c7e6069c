import type { Knex } from "knex";
import { runSignalCheck, type CheckReport } from "../src/server/signals/check.ts";
import { loadEngineSignalInputs } from "../src/server/signals/engine-inputs.ts";

/**
 * Organisations whose data changed since their last check (a reading set or usage was saved), and
 * organisations never checked at all (a new one, or the demo right after it was seeded).
 */
export async function findRequestedOrganisations(k: Knex): Promise<number[]> {
  const rows = await k("organisations")
    .whereNull("signals_checked_at")
    .orWhereRaw("signals_requested_at > signals_checked_at")
    .orderBy("id")
    .select("id");
  return rows.map((r) => Number(r.id));
}

/** Checks the given organisations (the scheduled run also queues each person's daily digest). */
export async function run(ctx: {
  db: Knex;
  now: () => Date;
  log: (line: string) => void;
  organisationIds: number[];
  digest?: boolean;
}): Promise<CheckReport[]> {
  const reports: CheckReport[] = [];
  for (const id of ctx.organisationIds) {
    const started = Date.now();
    const r = await runSignalCheck(ctx.db, id, ctx.now(), loadEngineSignalInputs, { digest: ctx.digest });
    reports.push(r);
    ctx.log(
      `signals: organisation ${id}: ${r.engines} engines, ${r.opened} opened, ${r.escalated} worse, ${r.autoResolved} cleared, ${r.mailsQueued} mails queued (${Date.now() - started} ms)`,
    );
  }
  return reports;
}
