import { deliverOutbox, type DeliveryReport } from "../src/server/mail/outbox.ts";

/** Sends what waits in the outbox (invitations, resets, signals), retrying failures with backoff. */
export async function run(ctx: { now: () => Date; log: (line: string) => void }): Promise<DeliveryReport> {
  const report = await deliverOutbox({ now: ctx.now });
  if (report.sent + report.failed + report.deferred > 0) {
    ctx.log(`mail: ${report.sent} sent, ${report.deferred} to retry, ${report.failed} given up`);
  }
  return report;
}
