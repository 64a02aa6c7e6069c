import type { Knex } from "knex";
import { computeDisplacementCc, computeSweptCc } from "../lib/domain/compression.ts";
import type { Engine } from "../lib/motors/types.ts";
import { db } from "./client.ts";
import { toIso, toNumber, toNumberOrNull } from "./row-values.ts";

export interface EngineRow {
  id: number;
  organisation_id: number;
  name: string;
  serial: string | null;
  cycle: Engine["cycle"];
  cylinders: number;
  bore_mm: number;
  stroke_mm: number;
  rod_mm: number | null;
  exhaust_opens_deg_atdc: number | null;
  target_ratio: number | null;
  target_squish_mm: number | null;
  build_fuel_note: string | null;
  build_min_octane: number | null;
  built_for_min_elevation_m: number | null;
  built_for_max_elevation_m: number | null;
  racing_class_id: number | null;
  status: Engine["status"];
  notes: string | null;
  top_end_limit: number | null;
  bottom_end_limit: number | null;
  inspection_interval: number | null;
  plan_fraction: number;
  archived_at: Date | null;
  created_at: Date;
  updated_at: Date;
}

export function toEngine(r: EngineRow): Engine {
  const boreMm = toNumber(r.bore_mm);
  const strokeMm = toNumber(r.stroke_mm);
  const cylinders = Number(r.cylinders);
  return {
    id: Number(r.id),
    name: r.name,
    serial: r.serial,
    cycle: r.cycle,
    cylinders,
    boreMm,
    strokeMm,
    rodMm: toNumberOrNull(r.rod_mm),
    exhaustOpensDegAtdc: toNumberOrNull(r.exhaust_opens_deg_atdc),
    targetRatio: toNumberOrNull(r.target_ratio),
    targetSquishMm: toNumberOrNull(r.target_squish_mm),
    buildFuelNote: r.build_fuel_note,
    buildMinOctane: toNumberOrNull(r.build_min_octane),
    builtForMinElevationM: toNumberOrNull(r.built_for_min_elevation_m),
    builtForMaxElevationM: toNumberOrNull(r.built_for_max_elevation_m),
    racingClassId: r.racing_class_id === null ? null : Number(r.racing_class_id),
    status: r.status,
    notes: r.notes,
    topEndLimit: toNumberOrNull(r.top_end_limit),
    bottomEndLimit: toNumberOrNull(r.bottom_end_limit),
    inspectionInterval: toNumberOrNull(r.inspection_interval),
    planFraction: toNumber(r.plan_fraction),
    archivedAt: toIso(r.archived_at),
    createdAt: toIso(r.created_at) ?? "",
    updatedAt: toIso(r.updated_at) ?? "",
    sweptCc: Math.round(computeSweptCc(boreMm, strokeMm) * 1e4) / 1e4,
    displacementCc: Math.round(computeDisplacementCc(boreMm, strokeMm, cylinders) * 1e4) / 1e4,
  };
}

/** API field → column, for inserts and partial updates. */
export const ENGINE_COLUMNS: Record<string, keyof EngineRow> = {
  name: "name",
  serial: "serial",
  cycle: "cycle",
  cylinders: "cylinders",
  boreMm: "bore_mm",
  strokeMm: "stroke_mm",
  rodMm: "rod_mm",
  exhaustOpensDegAtdc: "exhaust_opens_deg_atdc",
  targetRatio: "target_ratio",
  targetSquishMm: "target_squish_mm",
  buildFuelNote: "build_fuel_note",
  buildMinOctane: "build_min_octane",
  builtForMinElevationM: "built_for_min_elevation_m",
  builtForMaxElevationM: "built_for_max_elevation_m",
  racingClassId: "racing_class_id",
  status: "status",
  notes: "notes",
  topEndLimit: "top_end_limit",
  bottomEndLimit: "bottom_end_limit",
  inspectionInterval: "inspection_interval",
  planFraction: "plan_fraction",
};

export async function findEngineRow(
  organisationId: number,
  id: number,
  k: Knex = db(),
  opts: { forUpdate?: boolean } = {},
): Promise<EngineRow | undefined> {
  const q = k<EngineRow>("engines").where({ organisation_id: organisationId, id });
  if (opts.forUpdate) q.forUpdate();
  return q.first();
}

export async function findEngineRowsByIds(organisationId: number, ids: number[], k: Knex = db()): Promise<EngineRow[]> {
  if (ids.length === 0) return [];
  return k<EngineRow>("engines").where({ organisation_id: organisationId }).whereIn("id", ids);
}

/** Names and serials of the organisation's engines, for matching imported rows (case-insensitive). */
export async function listEngineKeys(organisationId: number, k: Knex = db()): Promise<{ id: number; name: string; serial: string | null; status: string; archived: boolean }[]> {
  const rows = await k("engines").where({ organisation_id: organisationId }).select("id", "name", "serial", "status", "archived_at");
  return rows.map((r) => ({ id: Number(r.id), name: r.name, serial: r.serial, status: r.status, archived: r.archived_at !== null }));
}
