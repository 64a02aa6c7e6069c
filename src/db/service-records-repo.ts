import type { Knex } from "knex";
import type { ServiceRecord } from "../lib/motors/types.ts";
import { db } from "./client.ts";
import { toIso } from "./row-values.ts";

export function toServiceRecord(r: Record<string, any>): ServiceRecord {
  return {
    id: Number(r.id),
    engineId: Number(r.engine_id),
    kind: r.kind,
    doneOn: r.done_on,
    jobId: r.job_id === null ? null : Number(r.job_id),
    notes: r.notes,
    doneBy: r.done_by ? { id: r.done_by, name: r.user_name ?? "" } : null,
    archivedAt: toIso(r.archived_at),
    createdAt: toIso(r.created_at) ?? "",
  };
}

export async function listServiceRecords(organisationId: number, engineId: number, includeArchived = false, k: Knex = db()): Promise<ServiceRecord[]> {
  const q = k("services as s")
    .leftJoin("users as u", "u.id", "s.done_by")
    .where({ "s.organisation_id": organisationId, "s.engine_id": engineId })
    .select("s.*", "u.name as user_name")
    .orderBy("s.done_on", "desc")
    .orderBy("s.id", "desc");
  if (!includeArchived) q.whereNull("s.archived_at");
  return (await q).map(toServiceRecord);
}

export interface ServiceInsert {
  organisation_id: number;
  engine_id: number;
  kind: ServiceRecord["kind"];
  done_on: string;
  job_id?: number | null;
  done_by: string | null;
  notes: string | null;
}

/** Writes a service record inside the caller's transaction (the bench's job completion uses this too). */
export async function insertServiceRecord(trx: Knex, row: ServiceInsert): Promise<number> {
  const [id] = await trx("services").insert(row);
  return Number(id);
}
