/**
 * The scheduled work of Ringland, as its own process beside the web server (`npm start` starts it).
 */
import cron from "node-cron";
import { closeDb } from "../src/db/client.ts";
import { run as deliverMail } from "./deliver-mail.ts";

const log = (line: string): void => console.log(`${new Date().toISOString()} ${line}`);
let busy = false;

async function tick(): Promise<void> {
  if (busy) return;
  busy = true;
  try {
    await deliverMail({ now: () => new Date(), log });
  } catch (err) {
    log(`job error: ${(err as Error).message}`);
  } finally {
    busy = false;
  }
}

const task = cron.schedule("* * * * *", () => void tick(), { noOverlap: true });
log("scheduled jobs started (mail delivery every minute)");
void tick();

async function stop(): Promise<void> {
  await task.stop();
  await closeDb();
  process.exit(0);
}
process.on("SIGTERM", () => void stop());
process.on("SIGINT", () => void stop());
