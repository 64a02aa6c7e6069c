import type { Knex } from "knex";
import { loadEngineCounters, loadPartCounters } from "../../db/counters-repo.ts";
import { toNumber, toNumberOrNull } from "../../db/row-values.ts";
import { listClosedDays, listEntryRows, listEventRows, loadShopSettings, type EntryRow, type EventRow } from "../../db/season-repo.ts";
import {
  JOB_RESETS,
  type JobKind,
  type JobPin,
  type PlannerEngine,
  type PlannerInput,
  type PlannerPart,
} from "../../lib/domain/planner/index.ts";
import type { BenchJobKind, ClosedDay, PlanEngine, ShopSettings } from "../../lib/season/types.ts";

// Reads everything the rebuild planner needs for one organisation and one `today` and turns it
// into a PlannerInput. The planner knows engines by their name and chassis by their number
// (both unique in an organisation), so its sentences read "A-2 … chassis #114"; events and
// entries by their database id as text.

export const TO_PLANNER_KIND: Record<BenchJobKind, JobKind> = { top_end: "topEnd", bottom_end: "bottomEnd", inspection: "inspection" };
export const FROM_PLANNER_KIND: Record<JobKind, BenchJobKind> = { topEnd: "top_end", bottomEnd: "bottom_end", inspection: "inspection" };

const UNIT_SHORT: Record<string, string> = { hours: "h", kilometres: "km", laps: "laps", litres: "L" };

/**
 * The job that opens an engine far enough to renew a part (common practice): pistons, rings,
 * cylinders, heads and inserts come off in a top end; cranks and rods need a bottom end.
 */
const PART_RENEWED_BY: Record<string, JobKind> = {
  piston: "topEnd",
  rings: "topEnd",
  cylinder: "topEnd",
  head: "topEnd",
  insert: "topEnd",
  other: "topEnd",
  crank: "bottomEnd",
  rod: "bottomEnd",
};

/** Past events still block shop days (travel and event days); older ones no longer matter. */
const PAST_EVENT_DAYS = 14;

export interface SeasonData {
  today: string;
  usageUnit: string;
  input: PlannerInput;
  events: EventRow[];
  entries: EntryRow[];
  engines: Map<number, PlanEngine>;
  /** Planner engine id (the name) → database id, for the engines the planner was given. */
  engineIdByName: Map<string, number>;
  chassisIdByNumber: Map<string, number>;
  shop: ShopSettings;
  closedDays: ClosedDay[];
  /** Engines the planner cannot use, and why. */
  notes: string[];
}

export function shiftDay(day: string, days: number): string {
  const d = new Date(`${day}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

const CYLINDER_WORDS = ["", "single", "twin", "triple", "four"];

/**
 * Engines of the same cylinders, bore, stroke and racing class are interchangeable: a chassis
 * takes the family of the engine it last carried (docs/decisions/050-season-plan-from-the-database.md).
 * The family reads as words because the planner quotes it ("the twin 72×73.8 mm engines …").
 */
function findFamily(r: { cylinders: unknown; bore_mm: unknown; stroke_mm: unknown; class_name?: unknown }): string {
  const n = Number(r.cylinders);
  const shape = `${CYLINDER_WORDS[n] ?? `${n}-cylinder`} ${toNumber(r.bore_mm)}×${toNumber(r.stroke_mm)} mm`;
  return typeof r.class_name === "string" && r.class_name !== "" ? `${shape} ${r.class_name}` : shape;
}

async function loadEngines(k: Knex, organisationId: number): Promise<Record<string, any>[]> {
  return k("engines as e")
    .leftJoin("installations as i", function () {
      this.on("i.engine_id", "=", "e.id").andOnNull("i.removed_at");
    })
    .leftJoin("chassis as c", "c.id", "i.chassis_id")
    .leftJoin("racing_classes as rc", "rc.id", "e.racing_class_id")
    .where("e.organisation_id", organisationId)
    .whereNull("e.archived_at")
    .select("e.*", "c.number as chassis_number", "rc.name as class_name")
    .orderBy("e.name");
}

/** The family of the engine most recently installed in each chassis: what the chassis takes. */
async function loadChassisFamilies(k: Knex, organisationId: number): Promise<Map<number, string>> {
  const [rows] = (await k.raw(
    `SELECT x.chassis_id, x.cylinders, x.bore_mm, x.stroke_mm, x.class_name FROM (
       SELECT i.chassis_id, e.cylinders, e.bore_mm, e.stroke_mm, rc.name AS class_name,
         ROW_NUMBER() OVER (PARTITION BY i.chassis_id ORDER BY (i.removed_at IS NULL) DESC, i.installed_at DESC, i.id DESC) AS rn
       FROM installations i JOIN engines e ON e.id = i.engine_id LEFT JOIN racing_classes rc ON rc.id = e.racing_class_id
       WHERE i.organisation_id = ?
     ) x WHERE x.rn = 1`,
    [organisationId],
  )) as [Record<string, unknown>[]];
  return new Map(rows.map((r) => [Number(r.chassis_id), findFamily(r as never)]));
}

async function loadParts(
  k: Knex,
  organisationId: number,
  engineNames: Map<number, string>,
  lastService: Map<number, Record<BenchJobKind, string | null>>,
): Promise<PlannerPart[]> {
  const engineIds = [...engineNames.keys()];
  if (engineIds.length === 0) return [];
  const rows = await k("parts as p")
    .where("p.organisation_id", organisationId)
    .whereNull("p.archived_at")
    .whereNotNull("p.usage_limit")
    .whereIn("p.engine_id", engineIds)
    .select("p.id", "p.serial", "p.kind", "p.engine_id", "p.usage_limit", "p.initial_usage")
    .select(k.raw("(SELECT MAX(pm.moved_on) FROM part_moves pm WHERE pm.part_id = p.id AND pm.to_engine_id = p.engine_id) AS fitted_on"));
  const counters = await loadPartCounters(
    organisationId,
    rows.map((r) => Number(r.id)),
    k,
  );
  const parts: PlannerPart[] = [];
  for (const r of rows) {
    const renewedBy = PART_RENEWED_BY[r.kind] ?? "topEnd";
    const c = counters.get(Number(r.id));
    const total = toNumber(r.initial_usage) + (c?.inStints ?? 0);
    const renewedOn = lastService.get(Number(r.engine_id))?.[FROM_PLANNER_KIND[renewedBy]] ?? null;
    const since = renewedBy === "topEnd" ? c?.sinceTopEnd : c?.sinceBottomEnd;
    // A part fitted after the engine's last renewal carries all its life; one that was in
    // the engine then was renewed with it and counts only what came after.
    const usage =
      renewedOn === null || (r.fitted_on ?? "") >= renewedOn || since === null || since === undefined ? total : Math.min(total, since);
    parts.push({
      id: `${r.kind} ${r.serial}`,
      name: `${r.kind} ${r.serial}`,
      engineId: engineNames.get(Number(r.engine_id)) ?? "",
      usage,
      limit: toNumber(r.usage_limit),
      renewedBy,
    });
  }
  return parts;
}

/** Engines on the bench now: they are free the day after the job's planned end, counters renewed. */
async function loadJobsInProgress(k: Knex, organisationId: number): Promise<Map<number, { kind: BenchJobKind; endsOn: string }>> {
  const rows = await k("jobs").where({ organisation_id: organisationId, state: "in_progress" }).select("engine_id", "kind", "ends_on");
  const out = new Map<number, { kind: BenchJobKind; endsOn: string }>();
  for (const r of rows) {
    const prev = out.get(Number(r.engine_id));
    if (!prev || r.ends_on > prev.endsOn) out.set(Number(r.engine_id), { kind: r.kind, endsOn: r.ends_on });
  }
  return out;
}

function toPlannerEngine(
  r: Record<string, any>,
  counters: { sinceTopEnd: number; sinceBottomEnd: number; sinceInspection: number },
  shop: ShopSettings,
  today: string,
  busy: { kind: BenchJobKind; endsOn: string } | undefined,
): PlannerEngine {
  const sinceTop = counters.sinceTopEnd;
  const engine: PlannerEngine = {
    id: r.name,
    name: r.name,
    family: findFamily(r as never),
    counters: { sinceTopEnd: sinceTop, sinceBottomEnd: counters.sinceBottomEnd, sinceInspection: counters.sinceInspection },
    policy: {
      topEndLimit: toNumber(r.top_end_limit),
      planFraction: Math.min(1, Math.max(0.01, toNumber(r.plan_fraction) || 0.8)),
    },
    chassisId: r.chassis_number ?? null,
    status: r.status,
    labourHours: { topEnd: shop.topEndHours, bottomEnd: shop.bottomEndHours, inspection: shop.inspectionHours },
  };
  const bottom = toNumberOrNull(r.bottom_end_limit);
  const inspection = toNumberOrNull(r.inspection_interval);
  if (bottom !== null && bottom > 0) engine.policy.bottomEndLimit = bottom;
  if (inspection !== null && inspection > 0) engine.policy.inspectionInterval = inspection;
  const minElevation = toNumberOrNull(r.built_for_min_elevation_m);
  if (minElevation !== null) engine.builtForMinElevationM = minElevation;
  if (busy) {
    for (const kind of JOB_RESETS[TO_PLANNER_KIND[busy.kind]]) {
      if (kind === "topEnd") engine.counters.sinceTopEnd = 0;
      if (kind === "bottomEnd") engine.counters.sinceBottomEnd = 0;
      if (kind === "inspection") engine.counters.sinceInspection = 0;
    }
    engine.availableFrom = shiftDay(busy.endsOn > today ? busy.endsOn : today, 1);
  }
  return engine;
}

async function loadLastServices(k: Knex, organisationId: number): Promise<Map<number, Record<BenchJobKind, string | null>>> {
  const rows: { engine_id: number; kind: string; on: string }[] = await k("services")
    .where({ organisation_id: organisationId })
    .whereNull("archived_at")
    .groupBy("engine_id", "kind")
    .select("engine_id", "kind", k.raw("MAX(done_on) AS `on`"));
  const out = new Map<number, Record<BenchJobKind, string | null>>();
  for (const r of rows) {
    const rec = out.get(Number(r.engine_id)) ?? { top_end: null, bottom_end: null, inspection: null };
    rec[r.kind as BenchJobKind] = r.on;
    out.set(Number(r.engine_id), rec);
  }
  return out;
}

/** Everything the planner needs, as it stands in the database for `today`. */
export async function loadSeasonData(k: Knex, organisationId: number, today: string, usageUnit: string): Promise<SeasonData> {
  const shop = await loadShopSettings(organisationId, k);
  const closedDays = await listClosedDays(organisationId, today, k);
  const events = await listEventRows(organisationId, { from: shiftDay(today, -PAST_EVENT_DAYS) }, k);
  const entries = await listEntryRows(
    events.map((e) => Number(e.id)),
    k,
  );
  const engineRows = await loadEngines(k, organisationId);
  const families = await loadChassisFamilies(k, organisationId);
  const busy = await loadJobsInProgress(k, organisationId);
  const lastService = await loadLastServices(k, organisationId);
  const notes: string[] = [];
  const plannable = engineRows.filter((r) => {
    if (toNumberOrNull(r.top_end_limit) !== null && toNumber(r.top_end_limit) > 0) return true;
    if (r.status !== "retired") notes.push(`${r.name} has no top-end limit, so the planner leaves it out.`);
    return false;
  });
  const counters = await loadEngineCounters(
    organisationId,
    plannable.map((r) => Number(r.id)),
    k,
  );
  const plannerEngines = plannable.map((r) =>
    toPlannerEngine(
      r,
      counters.get(Number(r.id)) ?? { sinceTopEnd: 0, sinceBottomEnd: 0, sinceInspection: 0 },
      shop,
      today,
      busy.get(Number(r.id)),
    ),
  );
  const engineNames = new Map<number, string>(plannable.map((r) => [Number(r.id), r.name as string]));
  const parts = await loadParts(k, organisationId, engineNames, lastService);
  const chassisIdByNumber = new Map<string, number>();
  for (const e of entries) chassisIdByNumber.set(e.chassis_number, Number(e.chassis_id));
  const entriesByEvent = new Map<number, EntryRow[]>();
  for (const e of entries) entriesByEvent.set(Number(e.event_id), [...(entriesByEvent.get(Number(e.event_id)) ?? []), e]);
  const inScope = new Set(events.filter((e) => e.starts_on >= today).map((e) => Number(e.id)));
  const input: PlannerInput = {
    today,
    usageUnit: UNIT_SHORT[usageUnit] ?? usageUnit,
    engines: plannerEngines,
    parts,
    events: events.map((ev) => ({
      id: String(ev.id),
      name: ev.name,
      startDate: ev.starts_on,
      endDate: ev.ends_on,
      elevationM: Number(ev.elevation_m),
      important: Boolean(ev.important),
      entries: (entriesByEvent.get(Number(ev.id)) ?? []).map((x) => {
        const family = families.get(Number(x.chassis_id));
        return {
          entryId: String(x.id),
          chassisId: x.chassis_number,
          expectedUsage: toNumber(x.expected_usage),
          ...(family ? { engineFamily: family } : {}),
        };
      }),
    })),
    shop: {
      hoursPerWeekday: shop.hoursPerWeekday,
      closedDates: closedDays.map((d) => d.day),
      travelDaysBeforeEvent: shop.travelDaysBeforeEvent,
      labourHours: { topEnd: shop.topEndHours, bottomEnd: shop.bottomEndHours, inspection: shop.inspectionHours },
      partsLeadDays: shop.partsLeadDays,
    },
    entryPins: entries
      .filter(
        (x) => Boolean(x.engine_pinned) && x.engine_id !== null && inScope.has(Number(x.event_id)) && engineNames.has(Number(x.engine_id)),
      )
      .map((x) => ({ entryId: String(x.id), engineId: engineNames.get(Number(x.engine_id)) as string })),
    jobPins: await loadJobPins(k, organisationId, today, engineNames),
  };
  const engines = new Map<number, PlanEngine>(
    engineRows.map((r) => [Number(r.id), { id: Number(r.id), name: r.name, chassisNumber: r.chassis_number ?? null, status: r.status }]),
  );
  const engineIdByName = new Map<string, number>([...engineNames].map(([id, name]) => [name, id]));
  return { today, usageUnit, input, events, entries, engines, engineIdByName, chassisIdByNumber, shop, closedDays, notes };
}

async function loadJobPins(k: Knex, organisationId: number, today: string, engineNames: Map<number, string>): Promise<JobPin[]> {
  const rows = await k("jobs")
    .where({ organisation_id: organisationId, state: "planned", pinned: true })
    .where("starts_on", ">=", today)
    .select("engine_id", "kind", "starts_on")
    .orderBy("starts_on")
    .orderBy("id");
  return rows
    .filter((r) => engineNames.has(Number(r.engine_id)))
    .map((r) => ({
      jobEngineId: engineNames.get(Number(r.engine_id)) as string,
      kind: TO_PLANNER_KIND[r.kind as BenchJobKind],
      date: r.starts_on,
    }));
}
