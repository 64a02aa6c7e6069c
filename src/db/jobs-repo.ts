import type { Knex } from "knex";
import type { BenchJob, BenchJobKind, ChecklistItem, JobPart, JobState } from "../lib/season/types.ts";
import { db } from "./client.ts";
import { toNumber, toNumberOrNull } from "./row-values.ts";

// Typed queries for bench jobs and the parts used on them.

export interface JobRow {
  id: number;
  organisation_id: number;
  engine_id: number;
  engine_name: string;
  chassis_number: string | null;
  kind: BenchJobKind;
  state: JobState;
  starts_on: string;
  ends_on: string;
  hours_by_date: string | Record<string, number> | null;
  labour_hours_planned: number;
  labour_hours_actual: number | null;
  pinned: number | boolean;
  for_event_id: number | null;
  for_event_name: string | null;
  reason: string | null;
  checklist: string | ChecklistItem[];
  assigned_to: string | null;
  assigned_name: string | null;
  done_by: string | null;
  done_name: string | null;
  done_on: string | null;
  notes: string | null;
}

function parseJson<T>(value: unknown, fallback: T): T {
  if (value === null || value === undefined) return fallback;
  return (typeof value === "string" ? JSON.parse(value) : value) as T;
}

export function toBenchJob(r: JobRow, parts: JobPart[] = []): BenchJob {
  return {
    id: Number(r.id),
    engineId: Number(r.engine_id),
    engineName: r.engine_name,
    chassisNumber: r.chassis_number ?? null,
    kind: r.kind,
    state: r.state,
    startsOn: r.starts_on,
    endsOn: r.ends_on,
    hoursByDate: parseJson<Record<string, number>>(r.hours_by_date, {}),
    labourHoursPlanned: toNumber(r.labour_hours_planned),
    labourHoursActual: toNumberOrNull(r.labour_hours_actual),
    pinned: Boolean(r.pinned),
    forEventId: r.for_event_id === null ? null : Number(r.for_event_id),
    forEventName: r.for_event_name ?? null,
    reason: r.reason,
    checklist: parseJson<ChecklistItem[]>(r.checklist, []),
    parts,
    assignedTo: r.assigned_to ? { id: r.assigned_to, name: r.assigned_name ?? "" } : null,
    doneBy: r.done_by ? { id: r.done_by, name: r.done_name ?? "" } : null,
    doneOn: r.done_on,
    notes: r.notes,
  };
}

function jobQuery(k: Knex): Knex.QueryBuilder {
  return k("jobs as j")
    .join("engines as e", "e.id", "j.engine_id")
    .leftJoin("installations as i", function () {
      this.on("i.engine_id", "=", "j.engine_id").andOnNull("i.removed_at");
    })
    .leftJoin("chassis as c", "c.id", "i.chassis_id")
    .leftJoin("events as ev", "ev.id", "j.for_event_id")
    .leftJoin("users as ua", "ua.id", "j.assigned_to")
    .leftJoin("users as ud", "ud.id", "j.done_by")
    .select(
      "j.*",
      "e.name as engine_name",
      "c.number as chassis_number",
      "ev.name as for_event_name",
      "ua.name as assigned_name",
      "ud.name as done_name",
    );
}

export interface JobFilter {
  states?: JobState[];
  engineId?: number;
  /** Jobs that end on or after this day. */
  from?: string;
  /** Jobs that start on or before this day. */
  to?: string;
  /** Done jobs finished on or after this day (others are unaffected). */
  doneSince?: string;
  limit?: number;
}

export async function listJobRows(organisationId: number, f: JobFilter = {}, k: Knex = db()): Promise<JobRow[]> {
  const q = jobQuery(k).where("j.organisation_id", organisationId);
  if (f.states?.length) q.whereIn("j.state", f.states);
  if (f.engineId !== undefined) q.where("j.engine_id", f.engineId);
  if (f.from) q.where("j.ends_on", ">=", f.from);
  if (f.to) q.where("j.starts_on", "<=", f.to);
  if (f.doneSince) {
    const since = f.doneSince;
    q.where((w) => w.whereNot("j.state", "done").orWhere("j.done_on", ">=", since));
  }
  q.orderBy("j.starts_on").orderBy("j.id");
  if (f.limit) q.limit(f.limit);
  return q;
}

export async function findJobRow(organisationId: number, id: number, k: Knex = db(), forUpdate = false): Promise<JobRow | undefined> {
  const q = jobQuery(k).where({ "j.organisation_id": organisationId, "j.id": id });
  if (forUpdate) q.forUpdate();
  return q.first();
}

export async function listJobParts(jobIds: number[], k: Knex = db()): Promise<Map<number, JobPart[]>> {
  const out = new Map<number, JobPart[]>();
  if (jobIds.length === 0) return out;
  const rows = await k("job_parts as jp")
    .leftJoin("parts as p", "p.id", "jp.part_id")
    .whereIn("jp.job_id", jobIds)
    .select("jp.*", "p.serial as part_serial", "p.kind as part_kind")
    .orderBy("jp.id");
  for (const r of rows) {
    const list = out.get(Number(r.job_id)) ?? [];
    list.push({
      id: Number(r.id),
      partId: r.part_id === null ? null : Number(r.part_id),
      partLabel: r.part_serial ? `${r.part_kind} ${r.part_serial}` : null,
      description: r.description,
      quantity: Number(r.quantity),
    });
    out.set(Number(r.job_id), list);
  }
  return out;
}

/** Job rows with their parts, in the order given. */
export async function assembleJobs(rows: JobRow[], k: Knex = db()): Promise<BenchJob[]> {
  const parts = await listJobParts(rows.map((r) => Number(r.id)), k);
  return rows.map((r) => toBenchJob(r, parts.get(Number(r.id)) ?? []));
}

export interface JobInsert {
  organisation_id: number;
  engine_id: number;
  kind: BenchJobKind;
  state: JobState;
  starts_on: string;
  ends_on: string;
  hours_by_date: string;
  labour_hours_planned: number;
  pinned: boolean;
  for_event_id: number | null;
  reason: string | null;
  checklist: string;
}

export async function insertJob(k: Knex, row: JobInsert): Promise<number> {
  const [id] = await k("jobs").insert(row);
  return Number(id);
}
