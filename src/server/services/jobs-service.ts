import { requestSignalCheck } from "../signals/request.ts";
import type { Knex } from "knex";
import { db } from "../../db/client.ts";
import { assembleJobs, findJobRow, listJobRows, type JobFilter } from "../../db/jobs-repo.ts";
import { roundTo } from "../../db/row-values.ts";
import { insertServiceRecord } from "../../db/service-records-repo.ts";
import { JOB_RESETS } from "../../lib/domain/planner/index.ts";
import { can } from "../../lib/permissions.ts";
import { JOB_KIND_LABELS, type BenchJob, type ChecklistItem, type JobState } from "../../lib/season/types.ts";
import { badRequest, conflict, forbidden, notFound } from "../errors.ts";
import { writeAudit } from "./audit.ts";
import { dayIn, loadOrgSettings, requireNotAfterToday, type Actor } from "./motors-common.ts";
import { FROM_PLANNER_KIND, shiftDay, TO_PLANNER_KIND } from "./season-input.ts";

// The bench: jobs by state, started, ticked off, their parts and hours written down, finished.
// Finishing writes a service record for the job's kind and for every kind it renews, so the
// counters follow, and asks for a new baseline reading set.

export const NO_JOB = "No job with that id in this organisation.";
const DONE_SHOWN_DAYS = 30;

export interface BaselinePrompt {
  engineId: number;
  engineName: string;
  kind: BenchJob["kind"];
  doneOn: string;
  href: string;
}

export interface Bench {
  today: string;
  planned: BenchJob[];
  inProgress: BenchJob[];
  done: BenchJob[];
  baselineNeeded: BaselinePrompt[];
}

export interface JobPatch {
  state?: JobState;
  checklist?: ChecklistItem[];
  labourHoursActual?: number | null;
  assignedTo?: string | null;
  notes?: string | null;
  doneOn?: string;
  parts?: { partId?: number | null; description: string; quantity: number }[];
}

export function createBaselineHref(engineId: number): string {
  return `/motors/${engineId}/readings/new?baseline=1`;
}

export async function listJobs(organisationId: number, filter: JobFilter): Promise<BenchJob[]> {
  return assembleJobs(await listJobRows(organisationId, filter));
}

export async function getJob(organisationId: number, jobId: number, k: Knex = db()): Promise<BenchJob> {
  const row = await findJobRow(organisationId, jobId, k);
  if (!row) throw notFound(NO_JOB);
  return (await assembleJobs([row], k))[0];
}

/** Engines rebuilt on the bench with no baseline reading set taken since. */
export async function listBaselineNeeded(organisationId: number, k: Knex = db()): Promise<BaselinePrompt[]> {
  const [rows] = (await k.raw(
    `SELECT j.engine_id, e.name, j.kind, j.done_on FROM jobs j
       JOIN engines e ON e.id = j.engine_id
       JOIN (SELECT engine_id, MAX(done_on) AS last_on FROM jobs
              WHERE organisation_id = ? AND state = 'done' AND kind IN ('top_end', 'bottom_end') GROUP BY engine_id) d
         ON d.engine_id = j.engine_id AND d.last_on = j.done_on
      WHERE j.organisation_id = ? AND j.state = 'done' AND j.kind IN ('top_end', 'bottom_end') AND e.archived_at IS NULL
        AND NOT EXISTS (SELECT 1 FROM reading_sets rs WHERE rs.engine_id = j.engine_id AND rs.is_baseline = 1
                          AND rs.archived_at IS NULL AND rs.taken_on >= j.done_on)
      ORDER BY j.done_on DESC, e.name`,
    [organisationId, organisationId],
  )) as [Record<string, any>[]];
  const seen = new Set<number>();
  const out: BaselinePrompt[] = [];
  for (const r of rows) {
    if (seen.has(Number(r.engine_id))) continue;
    seen.add(Number(r.engine_id));
    out.push({ engineId: Number(r.engine_id), engineName: r.name, kind: r.kind, doneOn: r.done_on, href: createBaselineHref(Number(r.engine_id)) });
  }
  return out;
}

export async function getBench(organisationId: number, now: Date): Promise<Bench> {
  const settings = await loadOrgSettings(organisationId);
  const today = dayIn(now, settings.timeZone);
  const jobs = await listJobs(organisationId, { states: ["planned", "in_progress", "done"], doneSince: shiftDay(today, -DONE_SHOWN_DAYS) });
  return {
    today,
    planned: jobs.filter((j) => j.state === "planned"),
    inProgress: jobs.filter((j) => j.state === "in_progress"),
    done: jobs.filter((j) => j.state === "done").sort((a, b) => (b.doneOn ?? "").localeCompare(a.doneOn ?? "")),
    baselineNeeded: await listBaselineNeeded(organisationId),
  };
}

const MOVES: Record<JobState, JobState[]> = {
  planned: ["in_progress", "done", "cancelled"],
  in_progress: ["planned", "done"],
  done: [],
  cancelled: [],
};

async function checkPeople(trx: Knex, organisationId: number, userId: string): Promise<void> {
  const member = await trx("memberships").where({ organisation_id: organisationId, user_id: userId }).whereIn("role", ["owner", "manager", "mechanic"]).first("id");
  if (!member) throw badRequest("Choose someone of this organisation who works jobs.", { assignedTo: "Not a mechanic, manager or owner here." });
}

async function replaceParts(trx: Knex, organisationId: number, jobId: number, parts: NonNullable<JobPatch["parts"]>): Promise<void> {
  const ids = parts.map((p) => p.partId).filter((id): id is number => typeof id === "number");
  const known = new Set(ids.length ? (await trx("parts").where({ organisation_id: organisationId }).whereIn("id", ids).select("id")).map((r) => Number(r.id)) : []);
  const fields: Record<string, string> = {};
  parts.forEach((p, i) => {
    if (typeof p.partId === "number" && !known.has(p.partId)) fields[`parts.${i}.partId`] = "No such part in this organisation.";
  });
  if (Object.keys(fields).length) throw badRequest("Check the parts.", fields);
  await trx("job_parts").where({ job_id: jobId }).delete();
  if (parts.length) await trx("job_parts").insert(parts.map((p) => ({ job_id: jobId, part_id: p.partId ?? null, description: p.description, quantity: p.quantity })));
}

/** Writes the service records a finished job stands for: its own kind and every kind it renews. */
async function writeServices(trx: Knex, organisationId: number, job: { id: number; engine_id: number; kind: BenchJob["kind"] }, doneOn: string, userId: string): Promise<number[]> {
  const ids: number[] = [];
  for (const kind of JOB_RESETS[TO_PLANNER_KIND[job.kind]]) {
    ids.push(
      await insertServiceRecord(trx, {
        organisation_id: organisationId,
        engine_id: Number(job.engine_id),
        kind: FROM_PLANNER_KIND[kind],
        done_on: doneOn,
        job_id: Number(job.id),
        done_by: userId,
        notes: kind === TO_PLANNER_KIND[job.kind] ? `Bench job #${job.id}` : `Renewed with the ${JOB_KIND_LABELS[job.kind].toLowerCase()} of bench job #${job.id}`,
      }),
    );
  }
  return ids;
}

function daysBetween(from: string, to: string): number {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000);
}

/**
 * A job started early or late keeps its length: its days move so that it starts today, and the
 * planner then holds the engine on the bench until its (moved) last day.
 */
function startToday(job: { starts_on: string; ends_on: string; hours_by_date: unknown }, today: string): Record<string, unknown> {
  const shift = daysBetween(job.starts_on, today);
  if (shift === 0) return {};
  const raw = typeof job.hours_by_date === "string" ? (JSON.parse(job.hours_by_date) as Record<string, number>) : ((job.hours_by_date ?? {}) as Record<string, number>);
  const hours: Record<string, number> = {};
  for (const [day, h] of Object.entries(raw)) hours[shiftDay(day, shift)] = h;
  return { starts_on: today, ends_on: shiftDay(job.ends_on, shift), hours_by_date: JSON.stringify(hours) };
}

export async function updateJob(actor: Actor, jobId: number, patch: JobPatch): Promise<{ job: BenchJob; baselinePrompt: BaselinePrompt | null }> {
  const organisationId = actor.membership.organisationId;
  const settings = await loadOrgSettings(organisationId);
  const today = dayIn(actor.now, settings.timeZone);
  let prompt: BaselinePrompt | null = null;
  await db().transaction(async (trx) => {
    // Finishing writes service records: the check is asked for first (src/server/signals/request.ts).
    if (patch.state === "done") await requestSignalCheck(trx, organisationId, actor.now);
    const job = await trx("jobs").where({ organisation_id: organisationId, id: jobId }).forUpdate().first();
    if (!job) throw notFound(NO_JOB);
    if (job.state === "done" || job.state === "cancelled") {
      throw conflict(job.state === "done" ? "A finished job is history; correct the engine's service records on its engine file." : "A cancelled job cannot change.");
    }
    const next = patch.state ?? job.state;
    if (next !== job.state && !MOVES[job.state as JobState].includes(next)) throw conflict(`A job that is ${job.state.replace("_", " ")} cannot become ${next.replace("_", " ")}.`);
    if (next === "cancelled" && !can(actor.membership, "season:plan")) throw forbidden("Only a team manager or owner may cancel a planned job.");
    if (patch.assignedTo) await checkPeople(trx, organisationId, patch.assignedTo);
    const columns: Record<string, unknown> = {};
    if (patch.checklist !== undefined) columns.checklist = JSON.stringify(patch.checklist);
    if (patch.labourHoursActual !== undefined) columns.labour_hours_actual = patch.labourHoursActual === null ? null : roundTo(patch.labourHoursActual, 2);
    if (patch.assignedTo !== undefined) columns.assigned_to = patch.assignedTo;
    if (patch.notes !== undefined) columns.notes = patch.notes;
    if (next === "in_progress" && job.state === "planned") {
      columns.assigned_to = patch.assignedTo ?? job.assigned_to ?? actor.userId;
      Object.assign(columns, startToday(job, today));
    }
    if (next !== job.state) columns.state = next;
    if (next === "done") {
      const doneOn = patch.doneOn ?? today;
      requireNotAfterToday("doneOn", doneOn, actor.now, settings.timeZone);
      columns.done_on = doneOn;
      columns.done_by = actor.userId;
      const services = await writeServices(trx, organisationId, job, doneOn, actor.userId);
      const engine = await trx("engines").where({ id: job.engine_id }).first("name");
      if (job.kind !== "inspection") prompt = { engineId: Number(job.engine_id), engineName: engine?.name ?? "", kind: job.kind, doneOn, href: createBaselineHref(Number(job.engine_id)) };
      await writeAudit(trx, { organisationId, actorUserId: actor.userId, action: "job.finished", entity: "job", entityId: jobId, details: { engineId: Number(job.engine_id), kind: job.kind, doneOn, services } });
    } else if (next !== job.state) {
      await writeAudit(trx, { organisationId, actorUserId: actor.userId, action: next === "in_progress" ? "job.started" : next === "cancelled" ? "job.cancelled" : "job.put_back", entity: "job", entityId: jobId, details: { from: job.state, to: next } });
    }
    if (patch.parts !== undefined) await replaceParts(trx, organisationId, jobId, patch.parts);
    if (Object.keys(columns).length) await trx("jobs").where({ id: jobId }).update({ ...columns, updated_at: trx.fn.now() });
    if (next === job.state && (patch.parts !== undefined || Object.keys(columns).length)) {
      await writeAudit(trx, { organisationId, actorUserId: actor.userId, action: "job.updated", entity: "job", entityId: jobId, details: { fields: Object.keys(patch) } });
    }
  });
  return { job: await getJob(organisationId, jobId), baselinePrompt: prompt };
}

/** The next job a mechanic would pick up: the earliest planned one. */
export async function findNextPlannedJob(organisationId: number): Promise<BenchJob | null> {
  const rows = await listJobRows(organisationId, { states: ["planned"], limit: 1 });
  return rows.length ? (await assembleJobs(rows))[0] : null;
}
