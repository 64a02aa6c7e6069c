import type { Knex } from "knex";
import { db } from "../../db/client.ts";
import { assembleJobs, listJobRows } from "../../db/jobs-repo.ts";
import { listEntryRows, listEventRows, toSeasonEntry, toSeasonEvent } from "../../db/season-repo.ts";
import { checkPlan, type PlanConflict, type PlannedJob, type Violation } from "../../lib/domain/planner/index.ts";
import { JOB_KIND_LABELS, type BenchJob, type PlanNote, type SeasonEvent, type SeasonPlanView, type WatchPointView } from "../../lib/season/types.ts";
import { shiftDay, TO_PLANNER_KIND, type SeasonData } from "./season-input.ts";

// The accepted plan as the calendar shows it, and a fresh check of it against today's data
// (usage logged since, events changed, a job that slipped): what no longer holds, in words.

/** How far back the calendar shows events and jobs. */
const HISTORY_DAYS = 180;

export interface StoredPlan {
  createdAt: string;
  plannedFrom: string;
  conflicts: PlanNote[];
  warnings: PlanNote[];
  entryExplanations: Record<string, string>;
  watchPoints: WatchPointView[];
  usageLeft: Record<string, number>;
  stats: SeasonPlanView["stats"];
}

function parse<T>(value: unknown, fallback: T): T {
  if (value === null || value === undefined) return fallback;
  return (typeof value === "string" ? JSON.parse(value) : value) as T;
}

export async function loadStoredPlan(organisationId: number, k: Knex = db()): Promise<StoredPlan | null> {
  const r = await k("season_plans").where({ organisation_id: organisationId }).orderBy("id", "desc").first();
  if (!r) return null;
  return {
    createdAt: new Date(r.created_at).toISOString(),
    plannedFrom: r.planned_from,
    conflicts: parse<PlanNote[]>(r.conflicts, []),
    warnings: parse<PlanNote[]>(r.warnings, []),
    entryExplanations: parse<{ entries: Record<string, string> }>(r.explanations, { entries: {} }).entries ?? {},
    watchPoints: parse<(Omit<WatchPointView, "engineName">)[]>(r.watch_points, []) as WatchPointView[],
    usageLeft: parse<Record<string, number>>(r.usage_left, {}),
    stats: parse<SeasonPlanView["stats"]>(r.stats, null),
  };
}

function describeJobId(job: BenchJob): string {
  return `${job.engineName} ${JOB_KIND_LABELS[job.kind].toLowerCase()} of ${job.startsOn}`;
}

function toCheckableJob(job: BenchJob): PlannedJob {
  return {
    id: describeJobId(job),
    engineId: job.engineName,
    kind: TO_PLANNER_KIND[job.kind],
    startDate: job.startsOn,
    endDate: job.endsOn,
    labourHours: job.labourHoursPlanned,
    hoursByDate: job.hoursByDate,
    reason: job.reason ?? "",
    pinned: job.pinned,
    forEventId: job.forEventId === null ? null : String(job.forEventId),
  };
}

function describeEntry(data: SeasonData, entryId: string | undefined): string {
  const x = data.entries.find((e) => String(e.id) === entryId);
  const ev = x ? data.events.find((e) => Number(e.id) === Number(x.event_id)) : undefined;
  return x && ev ? `${x.chassis_number} at ${ev.name} (${ev.starts_on})` : "an entry";
}

function describeViolation(data: SeasonData, v: Violation): string {
  switch (v.rule) {
    case "unplannedEntry":
      return `${describeEntry(data, v.entryId)} has no engine in the accepted plan.`;
    case "doubleBooked":
      return `${v.engineId} is entered in two places at once, among them ${describeEntry(data, v.entryId)}.`;
    case "entryPin":
      return `${describeEntry(data, v.entryId)} is pinned to ${v.engineId} but the accepted plan runs another engine there.`;
    case "unknownReference":
      return `${describeEntry(data, v.entryId)} refers to an engine the planner cannot use any more.`;
    default:
      return v.message.charAt(0).toUpperCase() + v.message.slice(1) + (v.message.endsWith(".") ? "" : ".");
  }
}

/** What no longer holds in the accepted plan against the data as it stands today. */
export function checkStoredPlan(data: SeasonData, stored: StoredPlan | null, planned: BenchJob[]): string[] {
  const nameOf = new Map([...data.engineIdByName].map(([name, id]) => [id, name]));
  const conflicts: PlanConflict[] = (stored?.conflicts ?? []).map((c) => ({
    kind: c.kind as PlanConflict["kind"],
    message: c.message,
    ...(c.entryId !== undefined ? { entryId: String(c.entryId) } : {}),
    ...(c.eventId !== undefined ? { eventId: String(c.eventId) } : {}),
    ...(c.engineId !== undefined && nameOf.has(c.engineId) ? { engineId: nameOf.get(c.engineId) } : {}),
  }));
  const conflicted = new Set(conflicts.map((c) => c.entryId).filter(Boolean));
  const inScope = new Set(data.events.filter((e) => e.starts_on >= data.today).map((e) => Number(e.id)));
  const assignments: Record<string, string> = {};
  for (const x of data.entries) {
    if (!inScope.has(Number(x.event_id)) || x.engine_id === null || conflicted.has(String(x.id))) continue;
    const name = nameOf.get(Number(x.engine_id));
    if (name !== undefined) assignments[String(x.id)] = name;
  }
  const jobs = planned.filter((j) => j.state === "planned" && nameOf.has(j.engineId)).map(toCheckableJob);
  const seen = new Set<string>();
  const out: string[] = [];
  for (const v of checkPlan(data.input, { assignments, jobs, conflicts })) {
    const text = describeViolation(data, v);
    if (!seen.has(text)) out.push(text);
    seen.add(text);
  }
  return out;
}

/**
 * One projected due date per engine, kind and day: an engine's own counter and the parts it
 * renews (pistons with the top end) reach their mark together, so they are named together.
 */
function mergeWatchPoints(data: SeasonData, stored: StoredPlan | null): WatchPointView[] {
  const out = new Map<string, WatchPointView>();
  for (const w of stored?.watchPoints ?? []) {
    if (w.date < data.today || !data.engines.has(w.engineId)) continue;
    const key = `${w.engineId}|${w.kind}|${w.date}`;
    const seen = out.get(key);
    if (!seen) out.set(key, { ...w, engineName: data.engines.get(w.engineId)?.name ?? "" });
    else if (w.limit > 0 && seen.limit > 0 && w.usageAfter / w.limit > seen.usageAfter / seen.limit) out.set(key, { ...seen, counter: w.counter, usageAfter: w.usageAfter, limit: w.limit });
  }
  return [...out.values()];
}

/** The season as the calendar shows it: events, jobs, projected due dates and the plan's notes. */
export async function assemblePlanView(data: SeasonData, stored: StoredPlan | null, organisationId: number, k: Knex = db()): Promise<SeasonPlanView> {
  const from = shiftDay(data.today, -HISTORY_DAYS);
  const eventRows = await listEventRows(organisationId, { from }, k);
  const entryRows = await listEntryRows(eventRows.map((e) => Number(e.id)), k);
  const events: SeasonEvent[] = eventRows.map((ev) =>
    toSeasonEvent(
      ev,
      entryRows.filter((x) => Number(x.event_id) === Number(ev.id)).map((x) => toSeasonEntry(x, stored?.usageLeft[String(x.id)] ?? null)),
    ),
  );
  const jobs = await assembleJobs(await listJobRows(organisationId, { states: ["planned", "in_progress", "done"], from }, k), k);
  const jobTexts: Record<string, string> = {};
  for (const j of jobs) if (j.reason) jobTexts[String(j.id)] = j.reason;
  return {
    today: data.today,
    usageUnit: data.usageUnit,
    plannedAt: stored?.createdAt ?? null,
    plannedFrom: stored?.plannedFrom ?? null,
    events,
    jobs,
    watchPoints: mergeWatchPoints(data, stored),
    conflicts: stored?.conflicts ?? [],
    warnings: stored?.warnings ?? [],
    explanations: { entries: stored?.entryExplanations ?? {}, jobs: jobTexts },
    checks: checkStoredPlan(data, stored, jobs),
    notes: data.notes,
    closedDays: data.closedDays,
    shop: data.shop,
    engines: [...data.engines.values()].filter((e) => e.status !== "retired"),
    stats: stored?.stats
      ? {
          rebuildCount: stored.stats.rebuildCount,
          lowerBound: stored.stats.lowerBound,
          inspectionCount: stored.stats.inspectionCount,
          entryCount: stored.stats.entryCount,
          assignedCount: stored.stats.assignedCount,
        }
      : null,
  };
}
