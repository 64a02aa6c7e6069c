import type { Knex } from "knex";
import { randomUUID } from "node:crypto";
import { db } from "../../db/client.ts";
import { env } from "../env.ts";
import { createMailTransport, sendMail, type MailTransport, type OutgoingMail } from "./transport.ts";

export interface QueuedMail extends OutgoingMail {
  dedupeKey: string; // one mail per key, ever
  organisationId: number | null;
}

/** Writes a mail to the outbox inside the caller's transaction; a second call with the same key is ignored. */
export async function enqueueMail(trx: Knex, mail: QueuedMail, now: Date): Promise<void> {
  await trx("mail_outbox")
    .insert({
      organisation_id: mail.organisationId,
      dedupe_key: mail.dedupeKey,
      to_address: mail.to,
      subject: mail.subject,
      body_text: mail.text,
      body_html: mail.html ?? null,
      headers: mail.headers ? JSON.stringify(mail.headers) : null,
      status: "pending",
      next_attempt_at: now,
    })
    .onConflict("dedupe_key")
    .ignore();
}

let transport: MailTransport | null = null;
function defaultTransport(): MailTransport {
  transport ??= createMailTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: env.SMTP_SECURE,
    user: env.SMTP_USER,
    pass: env.SMTP_PASSWORD,
  });
  return transport;
}

export const MAX_ATTEMPTS = 8;
const CLAIM_SECONDS = 120;

/** Backoff after the n-th failed attempt: 30 s, 1 min, 2 min … capped at 1 h. */
export function backoffSeconds(attempts: number): number {
  return Math.min(3600, 30 * 2 ** Math.max(0, attempts - 1));
}

export interface DeliveryReport {
  sent: number;
  failed: number;
  deferred: number;
}

/**
 * Delivers due mail. Each row is claimed first (status 'sending' with an expiry), so two runners
 * never send the same row, and a runner that dies leaves a claim that expires and is taken again.
 */
export async function deliverOutbox(
  opts: { now?: () => Date; limit?: number; transport?: MailTransport; ids?: number[] } = {},
): Promise<DeliveryReport> {
  const now = opts.now ?? (() => new Date());
  const runner = randomUUID();
  const k = db();
  const claimUntil = new Date(now().getTime() + CLAIM_SECONDS * 1000);
  const claimable = k("mail_outbox")
    .where((q) =>
      q
        .where((p) => p.where("status", "pending").andWhere("next_attempt_at", "<=", now()))
        .orWhere((p) => p.where("status", "sending").andWhere("claimed_until", "<", now())),
    )
    .orderBy("id")
    .limit(opts.limit ?? 200);
  if (opts.ids) claimable.whereIn("id", opts.ids);
  const candidates: { id: number }[] = await claimable.clone().select("id");
  const report: DeliveryReport = { sent: 0, failed: 0, deferred: 0 };
  const t = opts.transport ?? defaultTransport();
  for (const { id } of candidates) {
    const claimed = await k("mail_outbox")
      .where("id", id)
      .andWhere((q) =>
        q
          .where((p) => p.where("status", "pending").andWhere("next_attempt_at", "<=", now()))
          .orWhere((p) => p.where("status", "sending").andWhere("claimed_until", "<", now())),
      )
      .update({ status: "sending", claimed_by: runner, claimed_until: claimUntil, updated_at: now() });
    if (claimed !== 1) continue;
    const row = await k("mail_outbox").where("id", id).first();
    try {
      const headers = { ...(row.headers ? (typeof row.headers === "string" ? JSON.parse(row.headers) : row.headers) : {}) };
      headers["X-Ringland-Key"] = row.dedupe_key;
      await sendMail(
        t,
        { to: row.to_address, subject: row.subject, text: row.body_text, html: row.body_html ?? undefined, headers },
        env.MAIL_FROM,
      );
      await k("mail_outbox")
        .where({ id, claimed_by: runner })
        .update({ status: "sent", sent_at: now(), attempts: row.attempts + 1, last_error: null, updated_at: now() });
      report.sent += 1;
    } catch (err) {
      const attempts = row.attempts + 1;
      const giveUp = attempts >= MAX_ATTEMPTS;
      await k("mail_outbox")
        .where({ id, claimed_by: runner })
        .update({
          status: giveUp ? "failed" : "pending",
          attempts,
          last_error: String((err as Error).message ?? err).slice(0, 1000),
          next_attempt_at: new Date(now().getTime() + backoffSeconds(attempts) * 1000),
          claimed_by: null,
          claimed_until: null,
          updated_at: now(),
        });
      if (giveUp) report.failed += 1;
      else report.deferred += 1;
    }
  }
  return report;
}

/** Tries to send right away what a request just queued; failures stay queued for the job. */
export async function deliverSoon(dedupeKeys: string[]): Promise<void> {
  if (dedupeKeys.length === 0) return;
  try {
    const rows: { id: number }[] = await db()("mail_outbox").whereIn("dedupe_key", dedupeKeys).select("id");
    await deliverOutbox({ ids: rows.map((r) => r.id) });
  } catch {
    // The scheduled job retries; the request that queued the mail has already succeeded.
  }
}
