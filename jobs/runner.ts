/**
 * Ringland's scheduled work, as its own process beside the web server (`npm start` starts it).
 * Every minute it takes or renews the lease row; only the holder works, so several app servers
 * can each run this process and the work is still done once.
 *  - mail delivery from the outbox, every minute;
 *  - a signal check within a minute after a reading set or usage is saved;
 *  - each organisation's daily check (and digests) on its own schedule, in its own time zone.
 */
import cron, { type ScheduledTask } from "node-cron";
import { hostname } from "node:os";
import { randomUUID } from "node:crypto";
import { closeDb, db } from "../src/db/client.ts";
import { acquireLease, releaseLease } from "../src/server/jobs/lease.ts";
import { run as deliverMail } from "./deliver-mail.ts";
import { findRequestedOrganisations, run as checkSignals } from "./check-signals.ts";

export const LEASE_NAME = "scheduled-jobs";
const LEASE_MS = 90_000;
const holder = process.env.JOB_HOLDER ?? `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
const log = (line: string): void => console.log(`${new Date().toISOString()} [${holder}] ${line}`);

let busy = false;
async function holdsLease(): Promise<boolean> {
  const lease = await acquireLease(db(), LEASE_NAME, holder, LEASE_MS, new Date());
  return lease.held;
}

async function exclusive(what: string, work: () => Promise<void>): Promise<void> {
  if (busy) return;
  busy = true;
  try {
    if (!(await holdsLease())) return;
    await work();
  } catch (err) {
    log(`${what} failed: ${(err as Error).message}`);
  } finally {
    busy = false;
  }
}

async function everyMinute(): Promise<void> {
  await exclusive("minute tick", async () => {
    const requested = await findRequestedOrganisations(db());
    if (requested.length) await checkSignals({ db: db(), now: () => new Date(), log, organisationIds: requested });
    await deliverMail({ now: () => new Date(), log });
  });
  await refreshSchedules();
}

const schedules = new Map<number, { key: string; task: ScheduledTask }>();
async function refreshSchedules(): Promise<void> {
  try {
    const orgs = await db()("organisations").select("id", "signal_schedule", "time_zone");
    const seen = new Set<number>();
    for (const o of orgs) {
      const id = Number(o.id);
      seen.add(id);
      const key = `${o.signal_schedule}|${o.time_zone}`;
      if (schedules.get(id)?.key === key) continue;
      await schedules.get(id)?.task.stop();
      if (!cron.validate(o.signal_schedule)) continue;
      const task = cron.schedule(
        o.signal_schedule,
        () =>
          void exclusive(`daily check of organisation ${id}`, async () => {
            await checkSignals({ db: db(), now: () => new Date(), log, organisationIds: [id], digest: true });
            await deliverMail({ now: () => new Date(), log });
          }),
        { timezone: o.time_zone, name: `signals-${id}` },
      );
      schedules.set(id, { key, task });
    }
    for (const [id, s] of schedules) {
      if (!seen.has(id)) {
        await s.task.stop();
        schedules.delete(id);
      }
    }
  } catch (err) {
    log(`could not load schedules: ${(err as Error).message}`);
  }
}

const minute = cron.schedule("* * * * *", () => void everyMinute(), { name: "minute" });
log(`scheduled jobs started as ${holder}`);
void everyMinute();

async function stop(): Promise<void> {
  await minute.stop();
  for (const s of schedules.values()) await s.task.stop();
  await releaseLease(db(), LEASE_NAME, holder).catch(() => undefined);
  await closeDb();
  process.exit(0);
}
process.on("SIGTERM", () => void stop());
process.on("SIGINT", () => void stop());
