import { db } from "../../db/client.ts";
import { badRequest, notFound } from "../errors.ts";
import { writeAudit } from "./audit.ts";

export interface SignalRow {
  id: number;
  engineId: number;
  engineName: string;
  key: string;
  kind: string;
  severity: "watch" | "act";
  cylinder: number | null;
  metric: string | null;
  numbers: Record<string, number>;
  message: string;
  state: "open" | "acknowledged" | "resolved";
  openedAt: string;
  escalatedAt: string | null;
  acknowledgedBy: string | null;
  acknowledgedAt: string | null;
  resolvedBy: string | null;
  resolvedAt: string | null;
  resolutionNote: string | null;
}

export interface SignalFilters {
  kind?: string;
  severity?: "watch" | "act";
  state?: "open" | "acknowledged" | "resolved" | "active" | "all";
  engineId?: number;
  page?: number;
  perPage?: number;
}

const iso = (d: unknown): string | null => (d == null ? null : new Date(d as string).toISOString());

function toRow(r: Record<string, any>): SignalRow {
  return {
    id: Number(r.id),
    engineId: Number(r.engine_id),
    engineName: r.engine_name,
    key: r.signal_key,
    kind: r.kind,
    severity: r.severity,
    cylinder: r.cylinder,
    metric: r.metric,
    numbers: typeof r.numbers === "string" ? JSON.parse(r.numbers) : r.numbers,
    message: r.message,
    state: r.state,
    openedAt: iso(r.opened_at)!,
    escalatedAt: iso(r.escalated_at),
    acknowledgedBy: r.acknowledged_by_name ?? null,
    acknowledgedAt: iso(r.acknowledged_at),
    resolvedBy: r.resolved_by_name ?? (r.resolved_at ? "Ringland (the condition cleared)" : null),
    resolvedAt: iso(r.resolved_at),
    resolutionNote: r.resolution_note,
  };
}

export async function listSignals(
  organisationId: number,
  f: SignalFilters,
): Promise<{ signals: SignalRow[]; total: number; page: number; perPage: number }> {
  const perPage = f.perPage ?? 50;
  const page = f.page ?? 1;
  const q = db()("signals as s").join("engines as e", "e.id", "s.engine_id").where("s.organisation_id", organisationId);
  const state = f.state ?? "active";
  if (state === "active") q.whereIn("s.state", ["open", "acknowledged"]);
  else if (state !== "all") q.where("s.state", state);
  if (f.kind) q.where("s.kind", f.kind);
  if (f.severity) q.where("s.severity", f.severity);
  if (f.engineId) q.where("s.engine_id", f.engineId);
  const [{ n }] = await q.clone().count<{ n: number }[]>({ n: "*" });
  const rows = await q
    .leftJoin("users as ua", "ua.id", "s.acknowledged_by")
    .leftJoin("users as ur", "ur.id", "s.resolved_by")
    .orderByRaw("FIELD(s.state, 'open', 'acknowledged', 'resolved')")
    .orderByRaw("FIELD(s.severity, 'act', 'watch')")
    .orderBy("s.opened_at", "desc")
    .orderBy("s.id", "desc")
    .limit(perPage)
    .offset((page - 1) * perPage)
    .select("s.*", "e.name as engine_name", "ua.name as acknowledged_by_name", "ur.name as resolved_by_name");
  return { signals: rows.map(toRow), total: Number(n), page, perPage };
}

export async function countActiveSignals(organisationId: number): Promise<{ act: number; watch: number }> {
  const rows = await db()("signals")
    .where({ organisation_id: organisationId })
    .whereIn("state", ["open", "acknowledged"])
    .groupBy("severity")
    .select("severity")
    .count<{ severity: string; n: number }[]>({ n: "*" });
  const out = { act: 0, watch: 0 };
  for (const r of rows) out[r.severity as "act" | "watch"] = Number(r.n);
  return out;
}

export async function acknowledgeSignal(organisationId: number, userId: string, id: number, now: Date): Promise<void> {
  await db().transaction(async (trx) => {
    const s = await trx("signals").where({ id, organisation_id: organisationId }).forUpdate().first();
    if (!s) throw notFound("No such signal in this organisation.");
    if (s.state !== "open") throw badRequest(`This signal is already ${s.state}.`, { action: `already ${s.state}` });
    await trx("signals").where({ id }).update({ state: "acknowledged", acknowledged_by: userId, acknowledged_at: now, updated_at: now });
    await writeAudit(trx, { organisationId, actorUserId: userId, action: "signal.acknowledged", entity: "signal", entityId: id });
  });
}

export async function resolveSignal(organisationId: number, userId: string, id: number, note: string, now: Date): Promise<void> {
  await db().transaction(async (trx) => {
    const s = await trx("signals").where({ id, organisation_id: organisationId }).forUpdate().first();
    if (!s) throw notFound("No such signal in this organisation.");
    if (s.state === "resolved") throw badRequest("This signal is already resolved.", { action: "already resolved" });
    await trx("signals")
      .where({ id })
      .update({ state: "resolved", resolved_by: userId, resolved_at: now, resolution_note: note, updated_at: now });
    await writeAudit(trx, {
      organisationId,
      actorUserId: userId,
      action: "signal.resolved",
      entity: "signal",
      entityId: id,
      details: { note },
    });
  });
}
