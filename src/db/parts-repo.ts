import type { Knex } from "knex";
import type { PartEvent, PartKind, PartMove } from "../lib/motors/types.ts";
import { db } from "./client.ts";
import { likeTerm, toNumber, toNumberOrNull } from "./row-values.ts";

export interface PartRow {
  id: number;
  organisation_id: number;
  serial: string;
  kind: PartKind;
  description: string | null;
  engine_id: number | null;
  cylinder_no: number | null;
  usage_limit: number | null;
  initial_usage: number;
  max_total_cut_mm: number | null;
  max_oversize_mm: number | null;
  total_cut_mm: number;
  oversize_mm: number;
  notes: string | null;
  archived_at: Date | null;
  engine_name?: string | null;
}

export async function findPartRow(organisationId: number, id: number, k: Knex = db(), forUpdate = false): Promise<PartRow | undefined> {
  const q = k("parts as p")
    .leftJoin("engines as e", "e.id", "p.engine_id")
    .where({ "p.organisation_id": organisationId, "p.id": id })
    .select("p.*", "e.name as engine_name");
  if (forUpdate) q.forUpdate();
  return q.first();
}

export interface PartFilter {
  engineId?: number;
  kind?: string;
  onShelf?: boolean;
  search?: string;
  includeArchived?: boolean;
}

function filteredParts(organisationId: number, f: PartFilter, k: Knex): Knex.QueryBuilder {
  const q = k("parts as p").where("p.organisation_id", organisationId);
  if (f.engineId !== undefined) q.where("p.engine_id", f.engineId);
  if (f.kind) q.where("p.kind", f.kind);
  if (f.onShelf) q.whereNull("p.engine_id");
  if (!f.includeArchived) q.whereNull("p.archived_at");
  if (f.search) q.where((w) => w.where("p.serial", "like", likeTerm(f.search!)).orWhere("p.description", "like", likeTerm(f.search!)));
  return q;
}

export async function listPartRows(
  organisationId: number,
  f: PartFilter,
  page: { limit: number; offset: number },
  k: Knex = db(),
): Promise<{ rows: PartRow[]; total: number }> {
  const total = await filteredParts(organisationId, f, k).count<{ n: number }[]>({ n: "*" }).first();
  const rows = await filteredParts(organisationId, f, k)
    .leftJoin("engines as e", "e.id", "p.engine_id")
    .select("p.*", "e.name as engine_name")
    .orderByRaw("FIELD(p.kind, 'crank','rod','cylinder','piston','rings','head','insert','other')")
    .orderBy("p.cylinder_no")
    .orderBy("p.serial")
    .limit(page.limit)
    .offset(page.offset);
  return { rows, total: Number(total?.n ?? 0) };
}

export async function listPartMoves(
  organisationId: number,
  filter: { partId?: number; engineId?: number },
  k: Knex = db(),
): Promise<(PartMove & { serial: string; partKind: PartKind })[]> {
  const q = k("part_moves as m")
    .join("parts as p", "p.id", "m.part_id")
    .leftJoin("engines as ef", "ef.id", "m.from_engine_id")
    .leftJoin("engines as et", "et.id", "m.to_engine_id")
    .leftJoin("users as u", "u.id", "m.moved_by")
    .where("m.organisation_id", organisationId)
    .select("m.*", "ef.name as from_name", "et.name as to_name", "u.name as user_name", "p.serial", "p.kind")
    .orderBy("m.moved_on", "desc")
    .orderBy("m.id", "desc");
  if (filter.partId !== undefined) q.where("m.part_id", filter.partId);
  if (filter.engineId !== undefined) q.where((w) => w.where("m.from_engine_id", filter.engineId!).orWhere("m.to_engine_id", filter.engineId!));
  const rows = await q;
  return rows.map((r: Record<string, any>) => ({
    id: Number(r.id),
    partId: Number(r.part_id),
    fromEngineId: r.from_engine_id === null ? null : Number(r.from_engine_id),
    fromEngineName: r.from_name ?? null,
    toEngineId: r.to_engine_id === null ? null : Number(r.to_engine_id),
    toEngineName: r.to_name ?? null,
    toCylinderNo: r.to_cylinder_no === null ? null : Number(r.to_cylinder_no),
    movedOn: r.moved_on,
    notes: r.notes,
    movedBy: r.moved_by ? { id: r.moved_by, name: r.user_name ?? "" } : null,
    serial: r.serial,
    partKind: r.kind,
  }));
}

export async function listPartEvents(organisationId: number, filter: { partId?: number; engineId?: number }, k: Knex = db()): Promise<(PartEvent & { serial: string; partKind: PartKind })[]> {
  const q = k("part_events as ev")
    .join("parts as p", "p.id", "ev.part_id")
    .leftJoin("users as u", "u.id", "ev.done_by")
    .where("ev.organisation_id", organisationId)
    .select("ev.*", "u.name as user_name", "p.serial", "p.kind as part_kind")
    .orderBy("ev.done_on", "desc")
    .orderBy("ev.id", "desc");
  if (filter.partId !== undefined) q.where("ev.part_id", filter.partId);
  if (filter.engineId !== undefined) q.where("ev.engine_id", filter.engineId);
  const rows = await q;
  return rows.map((r: Record<string, any>) => ({
    id: Number(r.id),
    partId: Number(r.part_id),
    kind: r.kind,
    amountMm: toNumber(r.amount_mm),
    totalAfterMm: toNumber(r.total_after_mm),
    doneOn: r.done_on,
    engineId: toNumberOrNull(r.engine_id),
    notes: r.notes,
    doneBy: r.done_by ? { id: r.done_by, name: r.user_name ?? "" } : null,
    serial: r.serial,
    partKind: r.part_kind,
  }));
}

/** The date of the part's latest move, so a new move cannot be dated before it. */
export async function findLatestMoveOn(partId: number, k: Knex = db()): Promise<string | null> {
  const row = await k("part_moves").where({ part_id: partId }).max({ on: "moved_on" }).first();
  return (row?.on as string | null) ?? null;
}
