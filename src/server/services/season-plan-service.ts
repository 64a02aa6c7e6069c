import type { Knex } from "knex";
import { db } from "../../db/client.ts";
import { findEntryRow, findEventRow } from "../../db/season-repo.ts";
import { checkPlan, planRebuilds, type PlannerInput, type RebuildPlan } from "../../lib/domain/planner/index.ts";
import { createDefaultChecklist } from "../../lib/season/checklists.ts";
import { JOB_KIND_LABELS, type BenchJobKind, type PlanDiff, type SeasonPlanView } from "../../lib/season/types.ts";
import { conflict, notFound } from "../errors.ts";
import { writeAudit } from "./audit.ts";
import { NO_JOB } from "./jobs-service.ts";
import { dayIn, loadOrgSettings, type Actor } from "./motors-common.ts";
import { applyPlan, diffPlan, fingerprintInput, listPlannedJobs, type PlanCause, type StoredJob } from "./season-plan-store.ts";
import { assemblePlanView, loadStoredPlan } from "./season-plan-view.ts";
import { loadSeasonData, TO_PLANNER_KIND, type SeasonData } from "./season-input.ts";

// The manager's plan: see it, preview a re-plan and accept it, pin an engine to an entry, drag a
// job to another day. Every change is re-planned from today and re-checked; a change that
// breaks a hard rule is refused with the planner's own sentence and nothing is written.

export const NO_ENTRY = "No entry with that id in this event.";

export async function findToday(organisationId: number, now: Date, k: Knex = db()): Promise<{ today: string; usageUnit: string }> {
  const s = await loadOrgSettings(organisationId, k);
  return { today: dayIn(now, s.timeZone), usageUnit: s.usageUnit };
}

export async function loadDataFor(organisationId: number, now: Date, k: Knex = db()): Promise<SeasonData> {
  const { today, usageUnit } = await findToday(organisationId, now, k);
  return loadSeasonData(k, organisationId, today, usageUnit);
}

export async function getPlanView(organisationId: number, now: Date): Promise<SeasonPlanView> {
  const data = await loadDataFor(organisationId, now);
  return assemblePlanView(data, await loadStoredPlan(organisationId), organisationId);
}

/** Serialises plan writes per organisation: two managers never interleave half-plans. */
async function lockOrganisation(trx: Knex, organisationId: number): Promise<void> {
  await trx("organisations").where({ id: organisationId }).forUpdate().first("id");
}

export async function previewReplan(actor: Actor): Promise<PlanDiff> {
  const organisationId = actor.membership.organisationId;
  const data = await loadDataFor(organisationId, actor.now);
  const plan = planRebuilds(data.input);
  return diffPlan(data, await listPlannedJobs(db(), organisationId), plan, fingerprintInput(data));
}

/** Applies `plan`; the diff is against `before` (the planned jobs as they were before this change). */
async function commitPlan(trx: Knex, actor: Actor, cause: PlanCause, data: SeasonData, plan: RebuildPlan, details: Record<string, unknown>, before?: StoredJob[]): Promise<PlanDiff> {
  const organisationId = actor.membership.organisationId;
  const diff = diffPlan(data, before ?? (await listPlannedJobs(trx, organisationId)), plan, fingerprintInput(data));
  const planId = await applyPlan(trx, organisationId, actor.userId, cause, data, plan);
  await writeAudit(trx, {
    organisationId,
    actorUserId: actor.userId,
    action: `plan.${cause === "replan" ? "accepted" : cause === "move" ? "job_moved" : cause === "pin" ? "engine_pinned" : "job_added"}`,
    entity: "season_plan",
    entityId: planId,
    details: {
      ...details,
      assignmentsChanged: diff.assignments.length,
      jobsAdded: diff.jobsAdded.length,
      jobsMoved: diff.jobsMoved.length,
      jobsRemoved: diff.jobsRemoved.length,
      conflicts: diff.conflicts.length,
    },
  });
  return diff;
}

export async function acceptReplan(actor: Actor, basis: string | undefined): Promise<PlanDiff> {
  const organisationId = actor.membership.organisationId;
  return db().transaction(async (trx) => {
    await lockOrganisation(trx, organisationId);
    const data = await loadDataFor(organisationId, actor.now, trx);
    if (basis !== undefined && basis !== fingerprintInput(data)) {
      throw conflict("Something changed since the preview (usage, events, the shop or a pin). Look at the new preview before accepting.", { basis: "out of date" });
    }
    return commitPlan(trx, actor, "replan", data, planRebuilds(data.input), { today: data.today });
  });
}

/**
 * Plans with one change and refuses it when it cannot hold: its own conflict first, then any
 * entry it would leave without an engine, then anything the independent checker finds.
 */
function planWithChange(data: SeasonData, changed: PlannerInput, isOwnConflict: (c: RebuildPlan["conflicts"][number]) => boolean): RebuildPlan {
  const before = new Set(planRebuilds(data.input).conflicts.map((c) => c.message));
  const plan = planRebuilds(changed);
  const own = plan.conflicts.find((c) => isOwnConflict(c) && !before.has(c.message));
  if (own) throw conflict(capitalise(own.message));
  const added = plan.conflicts.find((c) => !before.has(c.message));
  if (added) throw conflict(`That would leave the season short: ${added.message}.`);
  const violations = checkPlan(changed, plan);
  if (violations.length > 0) throw conflict(capitalise(violations[0].message));
  return plan;
}

function capitalise(text: string): string {
  const t = text.charAt(0).toUpperCase() + text.slice(1);
  return t.endsWith(".") ? t : `${t}.`;
}

function requirePlannable(data: SeasonData, engineId: number): string {
  const name = [...data.engineIdByName].find(([, id]) => id === engineId)?.[0];
  if (name === undefined) {
    const known = data.engines.get(engineId);
    throw conflict(known ? `${known.name} cannot be planned: it is retired or has no top-end limit.` : "No engine with that id in this organisation.");
  }
  return name;
}

function requireFutureDay(today: string, day: string, field: string): void {
  if (day < today) throw conflict(`That day has passed: the plan runs from today, ${today}.`, { [field]: "before today" });
}

/** Drags a planned job to another day: it becomes a pin, and the rest of the season is re-planned around it. */
export async function moveJob(actor: Actor, jobId: number, startsOn: string): Promise<PlanDiff> {
  const organisationId = actor.membership.organisationId;
  return db().transaction(async (trx) => {
    await lockOrganisation(trx, organisationId);
    const job = await trx("jobs").where({ organisation_id: organisationId, id: jobId }).forUpdate().first();
    if (!job) throw notFound(NO_JOB);
    if (job.state !== "planned") throw conflict("Only a planned job can be moved; this one is already on the bench or finished.");
    const data = await loadDataFor(organisationId, actor.now, trx);
    requireFutureDay(data.today, startsOn, "startsOn");
    const engine = requirePlannable(data, Number(job.engine_id));
    const kind = TO_PLANNER_KIND[job.kind as BenchJobKind];
    const pins = (data.input.jobPins ?? []).filter((p) => !(Boolean(job.pinned) && p.jobEngineId === engine && p.kind === kind && p.date === job.starts_on));
    const changed: PlannerInput = { ...data.input, jobPins: [...pins, { jobEngineId: engine, kind, date: startsOn }] };
    const plan = planWithChange(data, changed, (c) => c.kind === "jobPin" && c.engineId === engine && c.message.includes(` ${JOB_KIND_LABELS[job.kind as BenchJobKind].toLowerCase()} `));
    const before = await listPlannedJobs(trx, organisationId);
    await trx("jobs").where({ id: jobId }).update({ starts_on: startsOn, pinned: true, updated_at: trx.fn.now() });
    return commitPlan(trx, actor, "move", { ...data, input: changed }, plan, { jobId, from: job.starts_on, to: startsOn }, before);
  });
}

/** A manager adds a job by hand (an inspection, a rebuild on a chosen day): held as a pin. */
export async function addPinnedJob(actor: Actor, input: { engineId: number; kind: BenchJobKind; startsOn: string }): Promise<PlanDiff> {
  const organisationId = actor.membership.organisationId;
  return db().transaction(async (trx) => {
    await lockOrganisation(trx, organisationId);
    const data = await loadDataFor(organisationId, actor.now, trx);
    requireFutureDay(data.today, input.startsOn, "startsOn");
    const engine = requirePlannable(data, input.engineId);
    const kind = TO_PLANNER_KIND[input.kind];
    const changed: PlannerInput = { ...data.input, jobPins: [...(data.input.jobPins ?? []), { jobEngineId: engine, kind, date: input.startsOn }] };
    const plan = planWithChange(data, changed, (c) => c.kind === "jobPin" && c.engineId === engine);
    const pinned = plan.jobs.find((j) => j.pinned && j.engineId === engine && j.kind === kind && j.startDate === input.startsOn);
    if (!pinned) throw conflict("The shop cannot take that job on that day.");
    await trx("jobs").insert({
      organisation_id: organisationId,
      engine_id: input.engineId,
      kind: input.kind,
      state: "planned",
      starts_on: input.startsOn,
      ends_on: pinned.endDate,
      hours_by_date: JSON.stringify(pinned.hoursByDate),
      labour_hours_planned: pinned.labourHours,
      pinned: true,
      checklist: JSON.stringify(createDefaultChecklist(input.kind)),
    });
    return commitPlan(trx, actor, "job", { ...data, input: changed }, plan, { engineId: input.engineId, kind: input.kind, startsOn: input.startsOn });
  });
}

/** Pins an engine to an entry (re-planning the rest around it), or lifts the pin (engineId null). */
export async function pinEntryEngine(actor: Actor, eventId: number, entryId: number, engineId: number | null): Promise<PlanDiff | null> {
  const organisationId = actor.membership.organisationId;
  return db().transaction(async (trx) => {
    await lockOrganisation(trx, organisationId);
    const event = await findEventRow(organisationId, eventId, trx);
    const entry = event ? await findEntryRow(organisationId, eventId, entryId, trx, true) : undefined;
    if (!event || !entry) throw notFound(NO_ENTRY);
    const data = await loadDataFor(organisationId, actor.now, trx);
    if (event.starts_on < data.today) throw conflict("This event has started; the engines that ran it are history.");
    if (engineId === null) {
      await trx("event_entries").where({ id: entryId }).update({ engine_pinned: false, updated_at: trx.fn.now() });
      await writeAudit(trx, { organisationId, actorUserId: actor.userId, action: "entry.unpinned", entity: "event_entry", entityId: entryId, details: { eventId } });
      return null;
    }
    const engine = requirePlannable(data, engineId);
    const pins = (data.input.entryPins ?? []).filter((p) => p.entryId !== String(entryId));
    const changed: PlannerInput = { ...data.input, entryPins: [...pins, { entryId: String(entryId), engineId: engine }] };
    const plan = planWithChange(data, changed, (c) => c.kind === "entryPin" && c.entryId === String(entryId));
    await trx("event_entries").where({ id: entryId }).update({ engine_pinned: true, engine_id: engineId, updated_at: trx.fn.now() });
    const fresh = { ...data, input: changed, entries: data.entries.map((x) => (Number(x.id) === entryId ? { ...x, engine_id: engineId, engine_pinned: 1 } : x)) };
    return commitPlan(trx, actor, "pin", fresh, plan, { eventId, entryId, engineId });
  });
}
