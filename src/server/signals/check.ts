import type { Knex } from "knex";
import { createHash } from "node:crypto";
import { evaluateEngineSignals } from "../../lib/domain/signals.ts";
import { mergeThresholds } from "../../lib/domain/signal-rules/thresholds.ts";
import type { EngineSignalInput, Signal, SignalThresholdOverrides } from "../../lib/domain/signal-rules/types.ts";
import { reconcileSignals } from "../../lib/domain/signals.ts";
import { DomainInputError } from "../../lib/domain/errors.ts";
import { appUrl } from "../env.ts";
import { enqueueMail } from "../mail/outbox.ts";
import { composeSignalMail, type SignalForMail } from "./compose.ts";
import { loadRecipients, mailToken, topicOfKind, type Recipient, type Topic } from "./recipients.ts";

export interface EngineInputWithOverrides {
  input: EngineSignalInput;
  engineDbId: number;
  thresholdOverrides?: SignalThresholdOverrides | null;
}

export type EngineInputLoader = (
  k: Knex,
  organisationId: number,
  now: Date,
  page: { afterId: number; limit: number },
) => Promise<EngineInputWithOverrides[]>;

/** Engines are read and judged a page at a time, so memory stays flat for a large fleet. */
const PAGE_SIZE = 500;

export interface CheckReport {
  engines: number;
  opened: number;
  escalated: number;
  autoResolved: number;
  mailsQueued: number;
  skipped: { engineId: number; reason: string }[];
}

function parseJson<T>(v: unknown): T | null {
  if (v == null) return null;
  return (typeof v === "string" ? JSON.parse(v) : v) as T;
}

export function dayInZone(now: Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(now);
}

/**
 * Checks every engine of an organisation, opens what is new, resolves what cleared, raises the
 * severity of what got worse, and queues the mails, all in one transaction: a crash before the
 * commit leaves nothing, a crash after it leaves mails waiting in the outbox for the next run.
 */
export async function runSignalCheck(
  k: Knex,
  organisationId: number,
  now: Date,
  loader: EngineInputLoader,
  opts: { digest?: boolean } = {},
): Promise<CheckReport> {
  const org = await k("organisations").where({ id: organisationId }).first();
  const orgOverrides = parseJson<SignalThresholdOverrides>(org.signal_thresholds);
  const report: CheckReport = { engines: 0, opened: 0, escalated: 0, autoResolved: 0, mailsQueued: 0, skipped: [] };
  const current: (Signal & { engineDbId: number })[] = [];
  const skippedKeys = new Set<string>();
  const engineNames = new Map<number, string>();
  for (let afterId = 0; ; ) {
    const engines = await loader(k, organisationId, now, { afterId, limit: PAGE_SIZE });
    if (engines.length === 0) break;
    afterId = engines[engines.length - 1].engineDbId;
    report.engines += engines.length;
    for (const e of engines) {
      engineNames.set(e.engineDbId, e.input.engineName);
      try {
        const thresholds = mergeThresholds({ ...(orgOverrides ?? {}), ...mergeGroups(orgOverrides, e.thresholdOverrides) } as SignalThresholdOverrides);
        for (const s of evaluateEngineSignals(e.input, thresholds)) current.push({ ...s, engineDbId: e.engineDbId });
      } catch (err) {
        // One engine with data the rules cannot read must not stop the check of the others;
        // its open signals stay as they are until its data is mended.
        if (!(err instanceof DomainInputError)) throw err;
        report.skipped.push({ engineId: e.engineDbId, reason: err.message });
        skippedKeys.add(String(e.engineDbId));
      }
    }
    if (engines.length < PAGE_SIZE) break;
  }

  await k.transaction(async (trx) => {
    const open = await trx("signals")
      .where({ organisation_id: organisationId })
      .whereNot("state", "resolved")
      .forUpdate()
      .select("id", "signal_key as key", "severity", "engine_id");
    const result = reconcileSignals(
      open.filter((o) => !skippedKeys.has(String(o.engine_id))),
      current,
    );
    const toMail: SignalForMail[] = [];
    for (const s of result.toOpen as (Signal & { engineDbId: number })[]) {
      const [id] = await trx("signals")
        .insert({
          organisation_id: organisationId,
          engine_id: s.engineDbId,
          signal_key: s.key,
          kind: s.kind,
          severity: s.severity,
          cylinder: s.cylinder ?? null,
          metric: s.metric ?? null,
          numbers: JSON.stringify(s.numbers),
          message: s.message,
          state: "open",
          opened_at: now,
        })
        .onConflict()
        .ignore();
      if (!id) continue; // another runner opened it a moment ago, and queued its mail
      report.opened += 1;
      toMail.push({ id: Number(id), engineId: s.engineDbId, engineName: engineNames.get(s.engineDbId) ?? "", kind: s.kind, severity: s.severity, message: s.message, numbers: s.numbers });
    }
    for (const s of result.escalated as (Signal & { engineDbId: number })[]) {
      const row = open.find((o) => o.key === s.key)!;
      await trx("signals")
        .where({ id: row.id })
        .update({ severity: s.severity, numbers: JSON.stringify(s.numbers), message: s.message, escalated_at: now, updated_at: now });
      report.escalated += 1;
      toMail.push({ id: Number(row.id), engineId: s.engineDbId, engineName: engineNames.get(s.engineDbId) ?? "", kind: s.kind, severity: s.severity, message: s.message, numbers: s.numbers, escalated: true });
    }
    if (result.toAutoResolve.length) {
      report.autoResolved = await trx("signals")
        .where({ organisation_id: organisationId })
        .whereIn("signal_key", result.toAutoResolve)
        .whereNot("state", "resolved")
        .update({ state: "resolved", resolved_at: now, resolution_note: "The condition cleared at a later check.", updated_at: now });
    }
    const recipients = await loadRecipients(trx, organisationId);
    report.mailsQueued += await queueImmediate(trx, organisationId, org.name, recipients, toMail, now);
    if (opts.digest) report.mailsQueued += await queueDigests(trx, organisationId, org.name, org.time_zone, recipients, now);
    await trx("organisations").where({ id: organisationId }).update({ signals_checked_at: now });
  });
  return report;
}

function mergeGroups(
  org: SignalThresholdOverrides | null,
  engine: SignalThresholdOverrides | null | undefined,
): SignalThresholdOverrides {
  if (!engine) return {};
  const out: Record<string, unknown> = {};
  for (const [group, fields] of Object.entries(engine)) {
    const base = (org as Record<string, unknown> | null)?.[group];
    out[group] = typeof fields === "object" && fields ? { ...(base as object), ...fields } : fields;
  }
  return out as SignalThresholdOverrides;
}

/** One mail per person and engine for what this check opened or made worse. */
async function queueImmediate(trx: Knex, organisationId: number, orgName: string, recipients: Recipient[], signals: SignalForMail[], now: Date): Promise<number> {
  let n = 0;
  const byEngine = new Map<number, SignalForMail[]>();
  for (const s of signals) byEngine.set(s.engineId, [...(byEngine.get(s.engineId) ?? []), s]);
  for (const engineSignals of byEngine.values()) {
    for (const r of recipients) {
      const mine = engineSignals.filter((s) => r.modes[topicOfKind(s.kind)] === "immediate");
      if (mine.length === 0) continue;
      const topic = topicOfKind(mine[0].kind);
      const token = await mailToken(trx, r.userId, organisationId);
      const unsubscribeUrl = `${appUrl()}/unsubscribe/${token}?topic=${topic}`;
      const mail = composeSignalMail({ organisationName: orgName, recipientName: r.name, signals: mine, appUrl: appUrl(), unsubscribeUrl, digest: false });
      // The key names exactly these signals at these levels, so a second run (or runner) adds nothing.
      const what = createHash("sha256").update(mine.map((s) => `${s.id}:${s.severity}`).sort().join(",")).digest("hex").slice(0, 40);
      await enqueueMail(
        trx,
        { dedupeKey: `signals:${what}:${r.userId}`, organisationId, to: r.email, ...mail, headers: { "List-Unsubscribe": `<${unsubscribeUrl}>` } },
        now,
      );
      n += 1;
    }
  }
  return n;
}

/** One mail a day per person and topic with the signals opened in the last 24 hours. */
async function queueDigests(trx: Knex, organisationId: number, orgName: string, timeZone: string, recipients: Recipient[], now: Date): Promise<number> {
  const since = new Date(now.getTime() - 24 * 3600_000);
  const rows = await trx("signals as s")
    .join("engines as e", "e.id", "s.engine_id")
    .where("s.organisation_id", organisationId)
    .andWhere("s.opened_at", ">", since)
    .whereNot("s.state", "resolved")
    .select("s.id", "s.engine_id", "e.name as engine_name", "s.kind", "s.severity", "s.message", "s.numbers");
  if (rows.length === 0) return 0;
  const day = dayInZone(now, timeZone);
  let n = 0;
  for (const topic of ["drift", "due"] as Topic[]) {
    const signals: SignalForMail[] = rows
      .filter((r) => topicOfKind(r.kind) === topic)
      .map((r) => ({ id: Number(r.id), engineId: Number(r.engine_id), engineName: r.engine_name, kind: r.kind, severity: r.severity, message: r.message, numbers: parseJson(r.numbers) ?? {} }));
    if (signals.length === 0) continue;
    for (const r of recipients) {
      if (r.modes[topic] !== "digest") continue;
      const token = await mailToken(trx, r.userId, organisationId);
      const unsubscribeUrl = `${appUrl()}/unsubscribe/${token}?topic=${topic}`;
      const mail = composeSignalMail({ organisationName: orgName, recipientName: r.name, signals, appUrl: appUrl(), unsubscribeUrl, digest: true });
      await enqueueMail(trx, { dedupeKey: `digest:${organisationId}:${topic}:${r.userId}:${day}`, organisationId, to: r.email, ...mail, headers: { "List-Unsubscribe": `<${unsubscribeUrl}>` } }, now);
      n += 1;
    }
  }
  return n;
}
