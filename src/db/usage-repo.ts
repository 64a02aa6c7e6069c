import type { Knex } from "knex";
import type { UsageEntry, UsageUnit } from "../lib/motors/types.ts";
import { db } from "./client.ts";
import { toIso, toNumber, toNumberOrNull } from "./row-values.ts";

export interface UsageInsert {
  organisation_id: number;
  engine_id: number;
  occurred_on: string;
  session_label: string | null;
  event_label: string | null;
  amount: number;
  source: UsageEntry["source"];
  installation_id?: number | null;
  meter_reading?: number | null;
  import_key?: string | null;
  logged_by: string | null;
  notes?: string | null;
}

export function toUsageEntry(r: Record<string, any>, unit: UsageUnit): UsageEntry {
  return {
    id: Number(r.id),
    engineId: Number(r.engine_id),
    engineName: r.engine_name ?? "",
    occurredOn: r.occurred_on,
    amount: toNumber(r.amount),
    unit,
    source: r.source,
    sessionLabel: r.session_label,
    eventLabel: r.event_label,
    meterReading: toNumberOrNull(r.meter_reading),
    installationId: r.installation_id === null ? null : Number(r.installation_id),
    notes: r.notes,
    loggedBy: r.logged_by ? { id: r.logged_by, name: r.user_name ?? "" } : null,
    archivedAt: toIso(r.archived_at),
    createdAt: toIso(r.created_at) ?? "",
  };
}

export interface UsageFilter {
  engineId?: number;
  from?: string;
  to?: string;
  source?: string;
  includeArchived?: boolean;
}

export function filteredUsage(organisationId: number, f: UsageFilter, k: Knex = db()): Knex.QueryBuilder {
  const q = k("usage_entries as ue").where("ue.organisation_id", organisationId);
  if (f.engineId !== undefined) q.where("ue.engine_id", f.engineId);
  if (f.from) q.where("ue.occurred_on", ">=", f.from);
  if (f.to) q.where("ue.occurred_on", "<=", f.to);
  if (f.source) q.where("ue.source", f.source);
  if (!f.includeArchived) q.whereNull("ue.archived_at");
  return q;
}

export function withUsageNames(q: Knex.QueryBuilder): Knex.QueryBuilder {
  return q
    .join("engines as e", "e.id", "ue.engine_id")
    .leftJoin("users as u", "u.id", "ue.logged_by")
    .select("ue.*", "e.name as engine_name", "e.serial as engine_serial", "u.name as user_name");
}

export async function findUsageRow(organisationId: number, id: number, k: Knex = db(), forUpdate = false): Promise<Record<string, any> | undefined> {
  const q = withUsageNames(k("usage_entries as ue").where({ "ue.organisation_id": organisationId, "ue.id": id }));
  if (forUpdate) q.forUpdate();
  return q.first();
}

/** Which of these import keys the organisation holds already. */
export async function findExistingImportKeys(organisationId: number, keys: string[], k: Knex = db()): Promise<Set<string>> {
  const found = new Set<string>();
  for (let i = 0; i < keys.length; i += 1000) {
    const chunk = keys.slice(i, i + 1000);
    const rows = await k("usage_entries").where({ organisation_id: organisationId }).whereIn("import_key", chunk).select("import_key");
    for (const r of rows) found.add(r.import_key);
  }
  return found;
}

/** The usage of one engine as (day, amount) pairs, oldest first: for counters at a past date. */
export async function listEngineUsageDays(engineId: number, k: Knex = db()): Promise<{ on: string; amount: number }[]> {
  const rows: { occurred_on: string; amount: unknown }[] = await k("usage_entries")
    .where({ engine_id: engineId })
    .whereNull("archived_at")
    .groupBy("occurred_on")
    .orderBy("occurred_on")
    .select("occurred_on")
    .sum({ amount: "amount" });
  return rows.map((r) => ({ on: r.occurred_on, amount: toNumber(r.amount) }));
}
