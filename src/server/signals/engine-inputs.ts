import type { Knex } from "knex";
import { confirmReadings } from "../../lib/domain/readings.ts";
import type { CylinderReading, EngineSignalInput, ReadingSet, SignalThresholdOverrides, UsageCounter, UsageUnit } from "../../lib/domain/signal-rules/types.ts";
import { loadEngineCounters, loadPartCounters } from "../../db/counters-repo.ts";
import type { EngineInputWithOverrides } from "./check.ts";

const UNIT: Record<string, UsageUnit> = { hours: "h", litres: "L", kilometres: "km", laps: "laps" };
const PART_SPAN: Record<string, UsageCounter["span"]> = { piston: "top-end", rings: "top-end", cylinder: "top-end", crank: "bottom-end", rod: "bottom-end" };

const num = (v: unknown): number | null => (v == null ? null : Number(v));
const json = <T>(v: unknown): T | null => (v == null ? null : ((typeof v === "string" ? JSON.parse(v) : v) as T));

/**
 * Everything the signal rules need about each engine of an organisation that is not retired or
 * archived: counters against limits, the next event it is entered in, the baseline reading set
 * and every set taken after it, and its class limits.
 */
export async function loadEngineSignalInputs(
  k: Knex,
  organisationId: number,
  now: Date,
  page: { afterId: number; limit: number } = { afterId: 0, limit: 1_000_000 },
): Promise<EngineInputWithOverrides[]> {
  const org = await k("organisations").where({ id: organisationId }).first("usage_unit", "chamber_tolerance_cc");
  const unit = UNIT[org.usage_unit] ?? "h";
  const tolerance = Number(org.chamber_tolerance_cc ?? 0.2);
  const engines = await k("engines as e")
    .leftJoin("racing_classes as c", "c.id", "e.racing_class_id")
    .where("e.organisation_id", organisationId)
    .whereNull("e.archived_at")
    .whereNot("e.status", "retired")
    .andWhere("e.id", ">", page.afterId)
    .orderBy("e.id")
    .limit(page.limit)
    .select("e.*", "c.name as class_name", "c.min_squish_mm", "c.min_chamber_cc");
  if (engines.length === 0) return [];
  const ids = engines.map((e) => Number(e.id));
  const counters = await loadEngineCounters(organisationId, ids, k);

  const parts = await k("parts").where({ organisation_id: organisationId }).whereIn("engine_id", ids).whereNull("archived_at").whereNotNull("usage_limit");
  const partCounters = await loadPartCounters(organisationId, parts.map((p) => Number(p.id)), k);

  const today = now.toISOString().slice(0, 10);
  const nextEvents = await k("event_entries as x")
    .join("events as ev", "ev.id", "x.event_id")
    .where("ev.organisation_id", organisationId)
    .whereNull("ev.archived_at")
    .whereIn("x.engine_id", ids)
    .andWhere("ev.ends_on", ">=", today)
    .orderBy("ev.starts_on")
    .select("x.engine_id", "ev.name", "x.expected_usage");

  const sets = await k("reading_sets").where({ organisation_id: organisationId }).whereIn("engine_id", ids).whereNull("archived_at").orderBy(["engine_id", "taken_on", "id"]);
  const cylinders = sets.length
    ? await k("cylinder_readings").whereIn("reading_set_id", sets.map((s) => s.id)).orderBy(["reading_set_id", "cylinder_no"])
    : [];
  const cylindersBySet = new Map<number, CylinderReading[]>();
  for (const c of cylinders) {
    const values = (json<number[]>(c.chamber_readings_cc) ?? []).map(Number);
    const agreement = values.length ? confirmReadings(values, tolerance) : null;
    const a = num(c.squish_a_mm);
    const b = num(c.squish_b_mm);
    const list = cylindersBySet.get(Number(c.reading_set_id)) ?? [];
    list.push({
      cylinder: Number(c.cylinder_no),
      chamberCc: agreement?.status === "confirmed" ? agreement.value ?? null : null,
      chamberUnconfirmed: agreement?.status === "unconfirmed",
      chamberReadingsCc: values,
      squishMm: a != null && b != null ? [a, b] : null,
      crankingKpa: num(c.cranking_kpa),
      leakdownPct: num(c.leakdown_pct),
    });
    cylindersBySet.set(Number(c.reading_set_id), list);
  }
  const setsByEngine = new Map<number, typeof sets>();
  for (const s of sets) setsByEngine.set(Number(s.engine_id), [...(setsByEngine.get(Number(s.engine_id)) ?? []), s]);

  return engines.map((e): EngineInputWithOverrides => {
    const id = Number(e.id);
    const c = counters.get(id);
    const usage: UsageCounter[] = [];
    if (c && e.top_end_limit != null) usage.push({ id: "top-end", label: "top end", scope: "engine", span: "top-end", used: c.sinceTopEnd, limit: Number(e.top_end_limit), unit });
    if (c && e.bottom_end_limit != null) usage.push({ id: "bottom-end", label: "bottom end", scope: "engine", span: "bottom-end", used: c.sinceBottomEnd, limit: Number(e.bottom_end_limit), unit });
    if (c && e.inspection_interval != null) usage.push({ id: "inspection", label: "inspection", scope: "engine", span: "other", used: c.sinceInspection, limit: Number(e.inspection_interval), unit });
    for (const p of parts.filter((p) => Number(p.engine_id) === id)) {
      const pc = partCounters.get(Number(p.id));
      usage.push({
        id: `part:${p.id}`,
        label: `${p.kind} ${p.serial}${p.cylinder_no ? `, cylinder ${p.cylinder_no}` : ""}`,
        scope: "part",
        span: PART_SPAN[p.kind] ?? "other",
        used: Number(p.initial_usage ?? 0) + (pc?.inStints ?? 0),
        limit: Number(p.usage_limit),
        unit,
      });
    }
    const next = nextEvents.find((n) => Number(n.engine_id) === id);
    const engineSets = setsByEngine.get(id) ?? [];
    const baselineIndex = engineSets.map((s) => Boolean(s.is_baseline)).lastIndexOf(true);
    const toSet = (s: (typeof sets)[number]): ReadingSet => ({
      id: String(s.id),
      elevationM: Number(s.elevation_m),
      cylinders: cylindersBySet.get(Number(s.id)) ?? [],
    });
    const input: EngineSignalInput = {
      engineId: String(id),
      engineName: e.name,
      cylinderCount: Number(e.cylinders),
      planningFraction: e.plan_fraction != null ? Number(e.plan_fraction) : undefined,
      usage,
      nextEvent: next ? { name: next.name, expectedHours: Number(next.expected_usage), expectedLitres: Number(next.expected_usage), expectedUsage: Number(next.expected_usage) } : null,
      baseline: baselineIndex >= 0 ? toSet(engineSets[baselineIndex]) : null,
      readings: baselineIndex >= 0 ? engineSets.slice(baselineIndex + 1).map(toSet) : [],
      classLimits:
        e.class_name && (e.min_squish_mm != null || e.min_chamber_cc != null)
          ? { className: e.class_name, minSquishMm: num(e.min_squish_mm) ?? undefined, minChamberCc: num(e.min_chamber_cc) ?? undefined }
          : null,
    };
    return { input, engineDbId: id, thresholdOverrides: json<SignalThresholdOverrides>(e.signal_thresholds) };
  });
}
