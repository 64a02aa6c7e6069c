import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { roundTo, toNumber } from "../../db/row-values.ts";
import type { RebuildPlan, PlannedJob } from "../../lib/domain/planner/index.ts";
import { createDefaultChecklist } from "../../lib/season/checklists.ts";
import type { AssignmentChange, BenchJobKind, JobChange, PlanDiff, PlanNote } from "../../lib/season/types.ts";
import { FROM_PLANNER_KIND, type SeasonData } from "./season-input.ts";

// Writes a plan into the database (engines onto entries, planned jobs, the plan's notes) and
// works out what a new plan would change against the accepted one. Both take the caller's
// transaction, so the demo seed and the API write plans the same way.

export type PlanCause = "replan" | "move" | "pin" | "job" | "seed";

export interface StoredJob {
  id: number;
  engine_id: number;
  kind: BenchJobKind;
  starts_on: string;
  ends_on: string;
  pinned: number | boolean;
  for_event_id: number | null;
}

/** A short fingerprint of the planner input: a preview and its acceptance must agree on it. */
export function fingerprintInput(data: SeasonData): string {
  return createHash("sha256").update(JSON.stringify(data.input)).digest("hex").slice(0, 16);
}

export async function listPlannedJobs(k: Knex, organisationId: number): Promise<StoredJob[]> {
  return k("jobs")
    .where({ organisation_id: organisationId, state: "planned" })
    .select("id", "engine_id", "kind", "starts_on", "ends_on", "pinned", "for_event_id")
    .orderBy("starts_on")
    .orderBy("id");
}

/** Planner notes with database ids in place of the planner's names. */
export function toPlanNotes(
  items: { kind: string; message: string; entryId?: string; engineId?: string; eventId?: string }[],
  data: SeasonData,
): PlanNote[] {
  return items.map((c) => {
    const note: PlanNote = { kind: c.kind, message: c.message };
    if (c.entryId !== undefined) note.entryId = Number(c.entryId);
    if (c.eventId !== undefined) note.eventId = Number(c.eventId);
    const engineId = c.engineId === undefined ? undefined : data.engineIdByName.get(c.engineId);
    if (engineId !== undefined) note.engineId = engineId;
    return note;
  });
}

function isInScope(data: SeasonData, eventId: number): boolean {
  const ev = data.events.find((e) => Number(e.id) === eventId);
  return ev !== undefined && ev.starts_on >= data.today;
}

/** The engine each in-scope entry runs under `plan`: a pin that cannot hold keeps its engine. */
function findNextEngines(data: SeasonData, plan: RebuildPlan): Map<number, number | null> {
  const out = new Map<number, number | null>();
  for (const x of data.entries) {
    if (!isInScope(data, Number(x.event_id))) continue;
    const name = plan.assignments[String(x.id)];
    const next = name === undefined ? null : (data.engineIdByName.get(name) ?? null);
    out.set(Number(x.id), next === null && Boolean(x.engine_pinned) ? x.engine_id : next);
  }
  return out;
}

function engineName(data: SeasonData, id: number | null): string | null {
  return id === null ? null : (data.engines.get(id)?.name ?? null);
}

function eventName(data: SeasonData, id: number | null): string | null {
  if (id === null) return null;
  return data.events.find((e) => Number(e.id) === id)?.name ?? null;
}

function plannedEventId(job: PlannedJob): number | null {
  return job.forEventId === null ? null : Number(job.forEventId);
}

/** What accepting `plan` would change: engines on entries, and jobs added, moved or removed. */
export function diffPlan(data: SeasonData, current: StoredJob[], plan: RebuildPlan, basis: string): PlanDiff {
  const assignments: AssignmentChange[] = [];
  const next = findNextEngines(data, plan);
  for (const x of data.entries) {
    if (!next.has(Number(x.id))) continue;
    const to = next.get(Number(x.id)) ?? null;
    const from = x.engine_id === null ? null : Number(x.engine_id);
    if (from === to) continue;
    const ev = data.events.find((e) => Number(e.id) === Number(x.event_id));
    assignments.push({
      entryId: Number(x.id),
      eventId: Number(x.event_id),
      eventName: ev?.name ?? "",
      startsOn: ev?.starts_on ?? "",
      chassisNumber: x.chassis_number,
      from: engineName(data, from),
      to: engineName(data, to),
    });
  }
  const remaining = [...current];
  const jobsAdded: JobChange[] = [];
  const jobsMoved: JobChange[] = [];
  for (const job of plan.jobs) {
    const engineId = data.engineIdByName.get(job.engineId);
    const kind = FROM_PLANNER_KIND[job.kind];
    const forEvent = plannedEventId(job);
    const same = (s: StoredJob): boolean => Number(s.engine_id) === engineId && s.kind === kind;
    let at = remaining.findIndex((s) => same(s) && s.starts_on === job.startDate && Boolean(s.pinned) === job.pinned);
    // A planned job keeps its identity by the event it prepares for; a job just pinned to a new
    // day (a drag) is that engine's job of that kind wherever it was.
    if (at < 0 && !job.pinned) {
      at = remaining.findIndex((s) => same(s) && !s.pinned && (s.for_event_id === null ? null : Number(s.for_event_id)) === forEvent);
    }
    if (at < 0 && job.pinned) {
      const heldElsewhere = (s: StoredJob): boolean => plan.jobs.some((o) => o !== job && o.pinned && o.engineId === job.engineId && o.kind === job.kind && o.startDate === s.starts_on);
      at = remaining.findIndex((s) => same(s) && !heldElsewhere(s));
    }
    const change: JobChange = {
      engineName: job.engineId,
      kind,
      startsOn: job.startDate,
      endsOn: job.endDate,
      forEventName: eventName(data, forEvent),
    };
    if (at < 0) {
      jobsAdded.push(change);
      continue;
    }
    const [matched] = remaining.splice(at, 1);
    if (matched.starts_on !== job.startDate || matched.ends_on !== job.endDate)
      jobsMoved.push({ ...change, fromStartsOn: matched.starts_on });
  }
  // Pinned jobs are never removed by a re-plan (a pin that cannot hold stays, with its conflict).
  const jobsRemoved: JobChange[] = remaining
    .filter((s) => !s.pinned)
    .map((s) => ({
      engineName: engineName(data, Number(s.engine_id)) ?? "",
      kind: s.kind,
      startsOn: s.starts_on,
      endsOn: s.ends_on,
      forEventName: eventName(data, s.for_event_id === null ? null : Number(s.for_event_id)),
    }));
  return {
    basis,
    today: data.today,
    assignments,
    jobsAdded,
    jobsRemoved,
    jobsMoved,
    conflicts: toPlanNotes(plan.conflicts, data),
    warnings: toPlanNotes(plan.warnings, data),
    stats: { rebuildCount: plan.stats.rebuildCount, lowerBound: plan.stats.lowerBound, inspectionCount: plan.stats.inspectionCount },
    unchanged: assignments.length === 0 && jobsAdded.length === 0 && jobsMoved.length === 0 && jobsRemoved.length === 0,
  };
}

function explainJob(plan: RebuildPlan, job: PlannedJob): string {
  const text = plan.explanations.find((e) => e.subject === "job" && e.subjectId === job.id)?.text ?? job.reason;
  return text.charAt(0).toUpperCase() + text.slice(1);
}

function jobColumns(plan: RebuildPlan, job: PlannedJob): Record<string, unknown> {
  return {
    ends_on: job.endDate,
    hours_by_date: JSON.stringify(job.hoursByDate),
    labour_hours_planned: roundTo(job.labourHours, 2),
    reason: explainJob(plan, job),
  };
}

/**
 * Accepts `plan` (computed from `data` inside the same transaction): writes each in-scope
 * entry's engine, replaces the planned jobs that are not pinned, refreshes the pinned ones,
 * and records the plan's notes. Jobs in progress, done or cancelled are never touched.
 */
export async function applyPlan(
  trx: Knex,
  organisationId: number,
  userId: string | null,
  cause: PlanCause,
  data: SeasonData,
  plan: RebuildPlan,
): Promise<number> {
  for (const [entryId, engineId] of findNextEngines(data, plan)) {
    const row = data.entries.find((x) => Number(x.id) === entryId);
    if (row && (row.engine_id === null ? null : Number(row.engine_id)) !== engineId) {
      await trx("event_entries").where({ id: entryId }).update({ engine_id: engineId, updated_at: trx.fn.now() });
    }
  }
  await trx("jobs").where({ organisation_id: organisationId, state: "planned", pinned: false }).delete();
  const pinnedRows = await trx("jobs")
    .where({ organisation_id: organisationId, state: "planned", pinned: true })
    .select("id", "engine_id", "kind", "starts_on");
  for (const job of plan.jobs) {
    const engineId = data.engineIdByName.get(job.engineId);
    if (engineId === undefined) continue;
    const kind = FROM_PLANNER_KIND[job.kind];
    if (job.pinned) {
      const row = pinnedRows.find((r) => Number(r.engine_id) === engineId && r.kind === kind && r.starts_on === job.startDate);
      if (row)
        await trx("jobs")
          .where({ id: row.id })
          .update({ ...jobColumns(plan, job), updated_at: trx.fn.now() });
      continue;
    }
    await trx("jobs").insert({
      organisation_id: organisationId,
      engine_id: engineId,
      kind,
      state: "planned",
      starts_on: job.startDate,
      pinned: false,
      for_event_id: job.forEventId === null ? null : Number(job.forEventId),
      checklist: JSON.stringify(createDefaultChecklist(kind)),
      ...jobColumns(plan, job),
    });
  }
  const entryTexts: Record<string, string> = {};
  for (const e of plan.explanations) if (e.subject === "entry") entryTexts[e.subjectId] = e.text;
  const usageLeft: Record<string, number> = {};
  for (const [entryId, left] of Object.entries(plan.usageLeftAfter)) usageLeft[entryId] = roundTo(toNumber(left), 2);
  const watchPoints = plan.watchPoints
    .filter((w) => data.engineIdByName.has(w.engineId))
    .map((w) => ({ ...w, engineId: data.engineIdByName.get(w.engineId), kind: FROM_PLANNER_KIND[w.kind] }));
  const [id] = await trx("season_plans").insert({
    organisation_id: organisationId,
    planned_from: data.today,
    accepted_by: userId,
    cause,
    conflicts: JSON.stringify(toPlanNotes(plan.conflicts, data)),
    warnings: JSON.stringify(toPlanNotes(plan.warnings, data)),
    explanations: JSON.stringify({ entries: entryTexts }),
    watch_points: JSON.stringify(watchPoints),
    usage_left: JSON.stringify(usageLeft),
    stats: JSON.stringify(plan.stats),
  });
  return Number(id);
}
