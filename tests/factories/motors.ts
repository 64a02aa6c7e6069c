import type { Knex } from "knex";
import { psiToKpa } from "../../src/lib/domain/units.ts";

/**
 * Builders for engines, chassis, parts, usage, services and readings, shared by the tests and
 * the demo seed. They write rows directly with sensible defaults (no audit log, no API rules):
 * tests that exercise the rules go through the API.
 */

export interface RacingClassAttrs {
  name: string;
  minSquishMm?: number | null;
  minChamberCc?: number | null;
  minFlatPlateCc?: number | null;
  maxDisplacementCc?: number | null;
  squishWireNote?: string | null;
  notes?: string | null;
}

export async function createRacingClass(k: Knex, organisationId: number, a: RacingClassAttrs): Promise<number> {
  const [id] = await k("racing_classes").insert({
    organisation_id: organisationId,
    name: a.name,
    min_squish_mm: a.minSquishMm ?? null,
    min_chamber_cc: a.minChamberCc ?? null,
    min_flat_plate_cc: a.minFlatPlateCc ?? null,
    max_displacement_cc: a.maxDisplacementCc ?? null,
    squish_wire_note: a.squishWireNote ?? null,
    notes: a.notes ?? null,
  });
  return Number(id);
}

export interface ChassisAttrs {
  number: string;
  kind?: "sled" | "bike" | "kart" | "atv" | "utv" | "car" | "other";
  meterKind?: "hours" | "km" | "none";
  notes?: string | null;
}

export async function createChassis(k: Knex, organisationId: number, a: ChassisAttrs): Promise<number> {
  const [id] = await k("chassis").insert({
    organisation_id: organisationId,
    number: a.number,
    kind: a.kind ?? "sled",
    meter_kind: a.meterKind ?? "none",
    notes: a.notes ?? null,
  });
  return Number(id);
}

export interface EngineAttrs {
  name: string;
  serial?: string | null;
  cycle?: "two_stroke" | "four_stroke";
  cylinders?: number;
  boreMm?: number;
  strokeMm?: number;
  rodMm?: number | null;
  exhaustOpensDegAtdc?: number | null;
  targetRatio?: number | null;
  targetSquishMm?: number | null;
  buildFuelNote?: string | null;
  buildMinOctane?: number | null;
  builtForMinElevationM?: number | null;
  builtForMaxElevationM?: number | null;
  racingClassId?: number | null;
  status?: "running" | "bench" | "spare" | "retired";
  notes?: string | null;
  topEndLimit?: number | null;
  bottomEndLimit?: number | null;
  inspectionInterval?: number | null;
  planFraction?: number;
}

/** Defaults: a race twin two-stroke, 72 × 73.8 mm, rod 130 mm, exhaust opening 82° ATDC. */
export async function createEngine(k: Knex, organisationId: number, a: EngineAttrs): Promise<number> {
  const twoStroke = (a.cycle ?? "two_stroke") === "two_stroke";
  const [id] = await k("engines").insert({
    organisation_id: organisationId,
    name: a.name,
    serial: a.serial ?? null,
    cycle: a.cycle ?? "two_stroke",
    cylinders: a.cylinders ?? 2,
    bore_mm: a.boreMm ?? 72,
    stroke_mm: a.strokeMm ?? 73.8,
    rod_mm: a.rodMm === undefined ? 130 : a.rodMm,
    exhaust_opens_deg_atdc: a.exhaustOpensDegAtdc === undefined ? (twoStroke ? 82 : null) : a.exhaustOpensDegAtdc,
    target_ratio: a.targetRatio ?? null,
    target_squish_mm: a.targetSquishMm ?? null,
    build_fuel_note: a.buildFuelNote ?? null,
    build_min_octane: a.buildMinOctane ?? null,
    built_for_min_elevation_m: a.builtForMinElevationM ?? null,
    built_for_max_elevation_m: a.builtForMaxElevationM ?? null,
    racing_class_id: a.racingClassId ?? null,
    status: a.status ?? "spare",
    notes: a.notes ?? null,
    top_end_limit: a.topEndLimit === undefined ? 8 : a.topEndLimit,
    bottom_end_limit: a.bottomEndLimit === undefined ? 24 : a.bottomEndLimit,
    inspection_interval: a.inspectionInterval ?? null,
    plan_fraction: a.planFraction ?? 0.8,
  });
  return Number(id);
}

const asInstant = (v: Date | string): Date => (v instanceof Date ? v : new Date(/^\d{4}-\d{2}-\d{2}$/.test(v) ? `${v}T16:00:00Z` : v));

export async function installEngine(
  k: Knex,
  organisationId: number,
  a: { engineId: number; chassisId: number; installedAt: Date | string; meterAtInstall?: number | null; by?: string | null },
): Promise<number> {
  const [id] = await k("installations").insert({
    organisation_id: organisationId,
    engine_id: a.engineId,
    chassis_id: a.chassisId,
    installed_at: asInstant(a.installedAt),
    meter_at_install: a.meterAtInstall ?? null,
    installed_by: a.by ?? null,
  });
  return Number(id);
}

export async function removeEngine(
  k: Knex,
  installationId: number,
  a: { removedAt: Date | string; meterAtRemoval?: number | null; by?: string | null },
): Promise<void> {
  await k("installations")
    .where({ id: installationId })
    .update({ removed_at: asInstant(a.removedAt), meter_at_removal: a.meterAtRemoval ?? null, removed_by: a.by ?? null });
}

export interface PartAttrs {
  serial: string;
  kind: "piston" | "rings" | "crank" | "rod" | "cylinder" | "head" | "insert" | "other";
  description?: string | null;
  engineId?: number | null;
  cylinderNo?: number | null;
  installedOn?: string;
  usageLimit?: number | null;
  initialUsage?: number;
  maxTotalCutMm?: number | null;
  maxOversizeMm?: number | null;
  notes?: string | null;
  by?: string | null;
}

/** A part, with its first move into an engine when one is given. */
export async function createPart(k: Knex, organisationId: number, a: PartAttrs): Promise<number> {
  const [id] = await k("parts").insert({
    organisation_id: organisationId,
    serial: a.serial,
    kind: a.kind,
    description: a.description ?? null,
    engine_id: a.engineId ?? null,
    cylinder_no: a.engineId ? (a.cylinderNo ?? null) : null,
    usage_limit: a.usageLimit ?? null,
    initial_usage: a.initialUsage ?? 0,
    max_total_cut_mm: a.maxTotalCutMm ?? null,
    max_oversize_mm: a.maxOversizeMm ?? null,
    notes: a.notes ?? null,
  });
  if (a.engineId) {
    await k("part_moves").insert({
      organisation_id: organisationId,
      part_id: id,
      from_engine_id: null,
      to_engine_id: a.engineId,
      to_cylinder_no: a.cylinderNo ?? null,
      moved_on: a.installedOn ?? "2026-01-01",
      moved_by: a.by ?? null,
    });
  }
  return Number(id);
}

/** Moves a part (toEngineId null: to the shelf), optionally archiving it there (scrapped). */
export async function movePart(
  k: Knex,
  organisationId: number,
  partId: number,
  a: { toEngineId: number | null; movedOn: string; cylinderNo?: number | null; archive?: boolean; notes?: string | null; by?: string | null },
): Promise<void> {
  const part = await k("parts").where({ id: partId }).first("engine_id");
  await k("part_moves").insert({
    organisation_id: organisationId,
    part_id: partId,
    from_engine_id: part?.engine_id ?? null,
    to_engine_id: a.toEngineId,
    to_cylinder_no: a.toEngineId ? (a.cylinderNo ?? null) : null,
    moved_on: a.movedOn,
    moved_by: a.by ?? null,
    notes: a.notes ?? null,
  });
  await k("parts")
    .where({ id: partId })
    .update({
      engine_id: a.toEngineId,
      cylinder_no: a.toEngineId ? (a.cylinderNo ?? null) : null,
      ...(a.archive ? { archived_at: new Date(`${a.movedOn}T18:00:00Z`) } : {}),
    });
}

export async function recordPartEvent(
  k: Knex,
  organisationId: number,
  partId: number,
  a: { kind: "cut" | "oversize"; amountMm: number; doneOn: string; notes?: string | null; by?: string | null },
): Promise<void> {
  const part = await k("parts").where({ id: partId }).first();
  const totalAfter = a.kind === "cut" ? Number(part.total_cut_mm) + a.amountMm : a.amountMm;
  await k("part_events").insert({
    organisation_id: organisationId,
    part_id: partId,
    engine_id: part.engine_id,
    kind: a.kind,
    amount_mm: a.amountMm,
    total_after_mm: totalAfter,
    done_on: a.doneOn,
    done_by: a.by ?? null,
    notes: a.notes ?? null,
  });
  await k("parts")
    .where({ id: partId })
    .update(a.kind === "cut" ? { total_cut_mm: totalAfter } : { oversize_mm: totalAfter });
}

export interface UsageAttrs {
  engineId: number;
  occurredOn: string;
  amount: number;
  sessionLabel?: string | null;
  eventLabel?: string | null;
  source?: "manual" | "meter" | "import";
  installationId?: number | null;
  meterReading?: number | null;
  importKey?: string | null;
  notes?: string | null;
  by?: string | null;
}

export async function logUsage(k: Knex, organisationId: number, a: UsageAttrs): Promise<number> {
  const [id] = await k("usage_entries").insert({
    organisation_id: organisationId,
    engine_id: a.engineId,
    occurred_on: a.occurredOn,
    session_label: a.sessionLabel ?? null,
    event_label: a.eventLabel ?? null,
    amount: a.amount,
    source: a.source ?? "manual",
    installation_id: a.installationId ?? null,
    meter_reading: a.meterReading ?? null,
    import_key: a.importKey ?? null,
    logged_by: a.by ?? null,
    notes: a.notes ?? null,
  });
  return Number(id);
}

export async function recordService(
  k: Knex,
  organisationId: number,
  a: { engineId: number; kind: "top_end" | "bottom_end" | "inspection"; doneOn: string; notes?: string | null; by?: string | null },
): Promise<number> {
  const [id] = await k("services").insert({
    organisation_id: organisationId,
    engine_id: a.engineId,
    kind: a.kind,
    done_on: a.doneOn,
    done_by: a.by ?? null,
    notes: a.notes ?? null,
  });
  return Number(id);
}

export interface CylinderAttrs {
  cylinderNo: number;
  chamberReadingsCc?: number[];
  flatPlateCc?: number | null;
  squishAMm?: number | null;
  squishBMm?: number | null;
  crankingKpa?: number | null;
  leakdownPct?: number | null;
  notes?: string | null;
}

export interface ReadingSetAttrs {
  engineId: number;
  takenOn: string;
  elevationM: number;
  airTempC?: number | null;
  setKind?: "teardown" | "between_events" | "build";
  isBaseline?: boolean;
  methodNotes?: string | null;
  by?: string | null;
  cylinders: CylinderAttrs[];
}

export async function createReadingSet(k: Knex, organisationId: number, a: ReadingSetAttrs): Promise<number> {
  const [id] = await k("reading_sets").insert({
    organisation_id: organisationId,
    engine_id: a.engineId,
    taken_on: a.takenOn,
    taken_by: a.by ?? null,
    elevation_m: a.elevationM,
    air_temp_c: a.airTempC ?? null,
    method_notes: a.methodNotes ?? null,
    is_baseline: a.isBaseline ?? false,
    set_kind: a.setKind ?? "between_events",
  });
  await k("cylinder_readings").insert(
    a.cylinders.map((c) => ({
      reading_set_id: id,
      cylinder_no: c.cylinderNo,
      chamber_readings_cc: JSON.stringify(c.chamberReadingsCc ?? []),
      flat_plate_cc: c.flatPlateCc ?? null,
      squish_a_mm: c.squishAMm ?? null,
      squish_b_mm: c.squishBMm ?? null,
      cranking_kpa: c.crankingKpa ?? null,
      leakdown_pct: c.leakdownPct ?? null,
      notes: c.notes ?? null,
    })),
  );
  return Number(id);
}

/** psi (gauge) to kPa, rounded as the column stores it: demo readings are written in psi. */
export function psiToKpaRounded(psi: number): number {
  return Math.round(psiToKpa(psi) * 10) / 10;
}
