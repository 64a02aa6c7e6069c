import type { Knex } from "knex";
import type { RacingClass } from "../lib/motors/types.ts";
import type { ClassRules } from "../lib/motors/reading-figures.ts";
import { db } from "./client.ts";
import { toIso, toNumberOrNull } from "./row-values.ts";

export interface RacingClassRow {
  id: number;
  organisation_id: number;
  name: string;
  min_squish_mm: number | null;
  min_chamber_cc: number | null;
  min_flat_plate_cc: number | null;
  max_displacement_cc: number | null;
  squish_wire_note: string | null;
  notes: string | null;
  archived_at: Date | null;
}

export function toRacingClass(r: RacingClassRow): RacingClass {
  return {
    id: Number(r.id),
    name: r.name,
    minSquishMm: toNumberOrNull(r.min_squish_mm),
    minChamberCc: toNumberOrNull(r.min_chamber_cc),
    minFlatPlateCc: toNumberOrNull(r.min_flat_plate_cc),
    maxDisplacementCc: toNumberOrNull(r.max_displacement_cc),
    squishWireNote: r.squish_wire_note,
    notes: r.notes,
    archivedAt: toIso(r.archived_at),
  };
}

export function toClassRules(c: RacingClass): ClassRules {
  return {
    id: c.id,
    name: c.name,
    minSquishMm: c.minSquishMm,
    minChamberCc: c.minChamberCc,
    minFlatPlateCc: c.minFlatPlateCc,
    maxDisplacementCc: c.maxDisplacementCc,
    squishWireNote: c.squishWireNote,
  };
}

export async function findRacingClass(organisationId: number, id: number, k: Knex = db()): Promise<RacingClassRow | undefined> {
  return k<RacingClassRow>("racing_classes").where({ organisation_id: organisationId, id }).first();
}

export async function listRacingClassRows(organisationId: number, includeArchived: boolean, k: Knex = db()): Promise<RacingClassRow[]> {
  const q = k<RacingClassRow>("racing_classes").where({ organisation_id: organisationId }).orderBy("name");
  if (!includeArchived) q.whereNull("archived_at");
  return q;
}

export async function findRacingClassesByIds(ids: number[], k: Knex = db()): Promise<Map<number, RacingClass>> {
  if (ids.length === 0) return new Map();
  const rows: RacingClassRow[] = await k("racing_classes").whereIn("id", [...new Set(ids)]);
  return new Map(rows.map((r) => [Number(r.id), toRacingClass(r)]));
}
