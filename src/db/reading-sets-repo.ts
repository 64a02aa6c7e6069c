import type { Knex } from "knex";
import type { CylinderReading } from "../lib/motors/types.ts";
import { db } from "./client.ts";
import { parseJsonArray, toNumberOrNull } from "./row-values.ts";

export interface ReadingSetRow {
  id: number;
  organisation_id: number;
  engine_id: number;
  taken_on: string;
  taken_by: string | null;
  elevation_m: number;
  air_temp_c: number | null;
  method_notes: string | null;
  is_baseline: number | boolean;
  set_kind: "teardown" | "between_events" | "build";
  archived_at: Date | null;
  created_at: Date;
  engine_name?: string;
  user_name?: string | null;
}

export function toCylinderReading(r: Record<string, any>): CylinderReading {
  return {
    cylinderNo: Number(r.cylinder_no),
    chamberReadingsCc: parseJsonArray(r.chamber_readings_cc),
    flatPlateCc: toNumberOrNull(r.flat_plate_cc),
    squishAMm: toNumberOrNull(r.squish_a_mm),
    squishBMm: toNumberOrNull(r.squish_b_mm),
    crankingKpa: toNumberOrNull(r.cranking_kpa),
    leakdownPct: toNumberOrNull(r.leakdown_pct),
    notes: r.notes ?? null,
  };
}

function setQuery(k: Knex): Knex.QueryBuilder {
  return k("reading_sets as rs")
    .join("engines as e", "e.id", "rs.engine_id")
    .leftJoin("users as u", "u.id", "rs.taken_by")
    .select("rs.*", "e.name as engine_name", "u.name as user_name");
}

export async function findReadingSetRow(organisationId: number, id: number, k: Knex = db(), forUpdate = false): Promise<ReadingSetRow | undefined> {
  const q = setQuery(k).where({ "rs.organisation_id": organisationId, "rs.id": id });
  if (forUpdate) q.forUpdate();
  return q.first();
}

export interface ReadingSetFilter {
  engineId?: number;
  from?: string;
  to?: string;
  baselineOnly?: boolean;
  includeArchived?: boolean;
}

function filtered(organisationId: number, f: ReadingSetFilter, k: Knex): Knex.QueryBuilder {
  const q = k("reading_sets as rs").where("rs.organisation_id", organisationId);
  if (f.engineId !== undefined) q.where("rs.engine_id", f.engineId);
  if (f.from) q.where("rs.taken_on", ">=", f.from);
  if (f.to) q.where("rs.taken_on", "<=", f.to);
  if (f.baselineOnly) q.where("rs.is_baseline", true);
  if (!f.includeArchived) q.whereNull("rs.archived_at");
  return q;
}

export async function listReadingSetRows(
  organisationId: number,
  f: ReadingSetFilter,
  page: { limit: number; offset: number; ascending?: boolean },
  k: Knex = db(),
): Promise<{ rows: ReadingSetRow[]; total: number }> {
  const total = await filtered(organisationId, f, k).count<{ n: number }[]>({ n: "*" }).first();
  const dir = page.ascending ? "asc" : "desc";
  const rows = await filtered(organisationId, f, k)
    .join("engines as e", "e.id", "rs.engine_id")
    .leftJoin("users as u", "u.id", "rs.taken_by")
    .select("rs.*", "e.name as engine_name", "u.name as user_name")
    .orderBy("rs.taken_on", dir)
    .orderBy("rs.id", dir)
    .limit(page.limit)
    .offset(page.offset);
  return { rows, total: Number(total?.n ?? 0) };
}

export async function listCylinderReadings(setIds: number[], k: Knex = db()): Promise<Map<number, CylinderReading[]>> {
  const out = new Map<number, CylinderReading[]>();
  for (let i = 0; i < setIds.length; i += 1000) {
    const rows = await k("cylinder_readings").whereIn("reading_set_id", setIds.slice(i, i + 1000)).orderBy("cylinder_no");
    for (const r of rows) {
      const list = out.get(Number(r.reading_set_id)) ?? [];
      list.push(toCylinderReading(r));
      out.set(Number(r.reading_set_id), list);
    }
  }
  return out;
}

/** The latest live reading set of each engine. */
export async function listLatestSetRows(organisationId: number, engineIds: number[], k: Knex = db()): Promise<ReadingSetRow[]> {
  if (engineIds.length === 0) return [];
  const [rows] = (await k.raw(
    `SELECT x.* FROM (
       SELECT rs.*, ROW_NUMBER() OVER (PARTITION BY rs.engine_id ORDER BY rs.taken_on DESC, rs.id DESC) AS rn
         FROM reading_sets rs WHERE rs.organisation_id = ? AND rs.engine_id IN (?) AND rs.archived_at IS NULL
     ) x WHERE x.rn = 1`,
    [organisationId, engineIds],
  )) as [ReadingSetRow[]];
  return rows;
}
