import { db } from "../../db/client.ts";
import { toNumber, toNumberOrNull } from "../../db/row-values.ts";
import { computeFuelCheck } from "../../lib/domain/calc-api.ts";
import { CAUTION_DEFAULT_FUEL_TABLE, FUEL_CAUTIONS } from "../../lib/domain/cautions.ts";
import { DomainInputError } from "../../lib/domain/errors.ts";
import { confirmChamberReadings } from "../../lib/domain/readings.ts";
import type { EventDetail, FuelCheckView } from "../../lib/season/types.ts";
import { loadOrgSettings } from "./motors-common.ts";
import { loadStoredPlan } from "./season-plan-view.ts";
import { getEvent } from "./season-service.ts";
import { loadSettings } from "./settings-service.ts";

// An event as the crew chief opens it: each entry's engine, the life it has left after the
// event, and the fuel check at the event's elevation and expected air temperature from the
// engine's build and its latest accepted chamber volume, against the team's own fuel table.

interface ChamberRecord {
  chamberCc: number;
  takenOn: string;
}

/**
 * The latest reading set in which at least one cylinder's burette readings agree; of its
 * cylinders, the smallest accepted volume (the highest compression: the conservative choice
 * for a fuel check).
 */
async function findAcceptedChambers(organisationId: number, engineIds: number[], toleranceCc: number): Promise<Map<number, ChamberRecord>> {
  const out = new Map<number, ChamberRecord>();
  if (engineIds.length === 0) return out;
  const rows = await db()("reading_sets as rs")
    .join("cylinder_readings as cr", "cr.reading_set_id", "rs.id")
    .where("rs.organisation_id", organisationId)
    .whereIn("rs.engine_id", engineIds)
    .whereNull("rs.archived_at")
    .select("rs.id", "rs.engine_id", "rs.taken_on", "cr.chamber_readings_cc")
    .orderBy("rs.taken_on", "desc")
    .orderBy("rs.id", "desc");
  let currentSet = -1;
  let best: number | null = null;
  const flush = (engineId: number, takenOn: string): void => {
    if (best !== null && !out.has(engineId)) out.set(engineId, { chamberCc: best, takenOn });
  };
  let last: { engineId: number; takenOn: string } | null = null;
  for (const r of rows) {
    if (Number(r.id) !== currentSet) {
      if (last) flush(last.engineId, last.takenOn);
      currentSet = Number(r.id);
      best = null;
      last = { engineId: Number(r.engine_id), takenOn: r.taken_on };
    }
    const raw = typeof r.chamber_readings_cc === "string" ? JSON.parse(r.chamber_readings_cc) : r.chamber_readings_cc;
    const values = Array.isArray(raw) ? raw.filter((v: unknown): v is number => typeof v === "number" && Number.isFinite(v)) : [];
    if (values.length < 2) continue;
    const agreement = confirmChamberReadings(values, toleranceCc);
    if (agreement.status === "confirmed" && agreement.value !== undefined) best = best === null ? agreement.value : Math.min(best, agreement.value);
  }
  if (last) flush(last.engineId, last.takenOn);
  return out;
}

export async function getEventDetail(organisationId: number, eventId: number): Promise<EventDetail> {
  const event = await getEvent(organisationId, eventId);
  const settings = await loadSettings(organisationId);
  const motors = await loadOrgSettings(organisationId);
  const stored = await loadStoredPlan(organisationId);
  const engineIds = [...new Set(event.entries.map((x) => x.engineId).filter((id): id is number => id !== null))];
  const engines = engineIds.length ? await db()("engines").where({ organisation_id: organisationId }).whereIn("id", engineIds) : [];
  const chambers = await findAcceptedChambers(organisationId, engineIds, motors.chamberToleranceCc);
  const fuelChecks: FuelCheckView[] = engines.map((e) => {
    const base = { engineId: Number(e.id), engineName: e.name as string };
    const chamber = chambers.get(Number(e.id));
    if (!chamber) return { ...base, check: null, note: `No accepted chamber volume on record for ${e.name}: record a reading set (two burette readings that agree) to see its fuel check.` };
    try {
      const r = computeFuelCheck({
        boreMm: toNumber(e.bore_mm),
        strokeMm: toNumber(e.stroke_mm),
        cylinders: Number(e.cylinders),
        chamberCc: chamber.chamberCc,
        ...(toNumberOrNull(e.rod_mm) !== null ? { rodMm: toNumber(e.rod_mm) } : {}),
        ...(toNumberOrNull(e.rod_mm) !== null && toNumberOrNull(e.exhaust_opens_deg_atdc) !== null ? { exhaustOpensDegAtdc: toNumber(e.exhaust_opens_deg_atdc) } : {}),
        elevationM: event.elevationM,
        ...(event.expectedAirTempC !== null ? { airTempC: event.expectedAirTempC } : {}),
        fuelTable: settings.fuelTable,
        ...(toNumberOrNull(e.built_for_min_elevation_m) !== null ? { builtForMinElevationM: toNumber(e.built_for_min_elevation_m) } : {}),
        ...(toNumberOrNull(e.build_min_octane) !== null ? { buildMinOctaneAki: toNumber(e.build_min_octane) } : {}),
      });
      return {
        ...base,
        note: null,
        check: {
          chamberCc: chamber.chamberCc,
          chamberTakenOn: chamber.takenOn,
          geometricRatio: r.geometricRatio,
          trappedRatio: r.trappedRatio ?? null,
          ratioBasis: r.ratioBasis,
          airTempC: r.airTempC,
          densityAltitudeM: r.densityAltitudeM,
          crankingKpaEstimate: r.crankingKpaEstimate,
          fuelGrade: r.fuelGrade,
          marginKpa: r.margin,
          fuelTableLabel: r.fuelTableLabel,
          riskFlags: r.riskFlags,
        },
      };
    } catch (err) {
      if (!(err instanceof DomainInputError)) throw err;
      return { ...base, check: null, note: `The fuel check cannot use ${e.name}'s build sheet (${err.field}: ${err.message}).` };
    }
  });
  const explanations: Record<string, string> = {};
  for (const x of event.entries) {
    const text = stored?.entryExplanations[String(x.id)];
    if (text) explanations[String(x.id)] = text;
    x.usageLeftAfter = stored?.usageLeft[String(x.id)] ?? null;
  }
  return {
    event,
    usageUnit: motors.usageUnit,
    fuelChecks,
    cautions: settings.fuelTableEdited ? [...FUEL_CAUTIONS] : [...FUEL_CAUTIONS, CAUTION_DEFAULT_FUEL_TABLE],
    explanations,
  };
}
