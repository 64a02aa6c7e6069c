import { checkEngineSeason, checkJobsAndShop, type EngineRun, type Violation } from "./check-jobs";
import type { PlannedJob, PlannerEngine, PlannerEvent, PlannerInput, RebuildPlan } from "./types";

export type { Violation, ViolationRule } from "./check-jobs";

// The independent checker: verifies any plan (the planner's, or one a manager changed by
// dragging a job) against the hard rules. It reads only the input and the plan, never the
// planner's internals, so a planner bug cannot hide itself.

export type CheckablePlan = Pick<RebuildPlan, "assignments" | "jobs" | "conflicts">;

interface EntryRef {
  entryId: string;
  chassisId: string;
  family: string | undefined;
  usage: number;
  event: PlannerEvent;
}

function indexEntries(input: PlannerInput): Map<string, EntryRef> {
  const entries = new Map<string, EntryRef>();
  for (const event of input.events) {
    for (const entry of event.entries) {
      entries.set(entry.entryId, { entryId: entry.entryId, chassisId: entry.chassisId, family: entry.engineFamily, usage: entry.expectedUsage, event });
    }
  }
  return entries;
}

function checkAssignments(input: PlannerInput, plan: CheckablePlan, entries: Map<string, EntryRef>, engines: Map<string, PlannerEngine>, out: Violation[]): Map<string, EngineRun[]> {
  const conflicted = new Set(plan.conflicts.flatMap((c) => (c.entryId !== undefined ? [c.entryId] : [])));
  const runs = new Map<string, EngineRun[]>();
  for (const [entryId, engineId] of Object.entries(plan.assignments).sort()) {
    const entry = entries.get(entryId);
    const engine = engines.get(engineId);
    if (!entry || !engine) {
      out.push({ rule: "unknownReference", entryId, engineId, message: `assignment ${entryId} → ${engineId} names an unknown entry or engine` });
      continue;
    }
    if (entry.event.startDate < input.today) {
      out.push({ rule: "unknownReference", entryId, engineId, message: `entry ${entryId} belongs to ${entry.event.name}, which started before today` });
      continue;
    }
    if (conflicted.has(entryId)) {
      out.push({ rule: "conflictedButAssigned", entryId, engineId, message: `entry ${entryId} is listed as a conflict yet has engine ${engineId}` });
    }
    if (entry.family !== undefined && engine.family !== entry.family) {
      out.push({ rule: "wrongFamily", entryId, engineId, message: `chassis ${entry.chassisId} takes a ${entry.family} engine but runs ${engineId} (${engine.family ?? "no family"})` });
    }
    if (engine.status === "retired") out.push({ rule: "retiredEngine", entryId, engineId, message: `retired engine ${engineId} is entered for ${entryId}` });
    if (engine.availableFrom !== undefined && engine.availableFrom > entry.event.startDate) {
      out.push({ rule: "engineUnavailable", entryId, engineId, message: `${engineId} is available from ${engine.availableFrom}, after ${entry.event.name} starts on ${entry.event.startDate}` });
    }
    const list = runs.get(engineId) ?? [];
    list.push({ entryId, event: entry.event, usage: entry.usage });
    runs.set(engineId, list);
  }
  for (const entry of entries.values()) {
    if (entry.event.startDate >= input.today && plan.assignments[entry.entryId] === undefined && !conflicted.has(entry.entryId)) {
      out.push({ rule: "unplannedEntry", entryId: entry.entryId, message: `entry ${entry.entryId} (chassis ${entry.chassisId} at ${entry.event.name}) has neither an engine nor a conflict` });
    }
  }
  return runs;
}

function checkDoubleBooking(engineId: string, runs: EngineRun[], out: Violation[]): void {
  const ordered = [...runs].sort((a, b) => (a.event.startDate < b.event.startDate ? -1 : a.event.startDate > b.event.startDate ? 1 : 0));
  let latest: EngineRun | null = null;
  for (const run of ordered) {
    if (latest && run.event.startDate <= latest.event.endDate) {
      out.push({ rule: "doubleBooked", engineId, entryId: run.entryId, message: `${engineId} is entered for ${latest.entryId} (${latest.event.name}) and ${run.entryId} (${run.event.name}) at the same time` });
    }
    if (!latest || run.event.endDate > latest.event.endDate) latest = run;
  }
}

function checkPins(input: PlannerInput, plan: CheckablePlan, entries: Map<string, EntryRef>, out: Violation[]): void {
  for (const pin of input.entryPins ?? []) {
    const entry = entries.get(pin.entryId);
    if (!entry || entry.event.startDate < input.today) continue;
    const held = plan.assignments[pin.entryId] === pin.engineId;
    const reported = plan.assignments[pin.entryId] === undefined && plan.conflicts.some((c) => c.kind === "entryPin" && c.entryId === pin.entryId);
    if (!held && !reported) {
      out.push({ rule: "entryPin", entryId: pin.entryId, engineId: pin.engineId, message: `entry ${pin.entryId} is pinned to ${pin.engineId} but runs ${plan.assignments[pin.entryId] ?? "nothing"} and no conflict says why` });
    }
  }
  for (const pin of input.jobPins ?? []) {
    const held = plan.jobs.some((j) => j.engineId === pin.jobEngineId && j.kind === pin.kind && j.startDate === pin.date);
    const reported = plan.conflicts.some((c) => c.kind === "jobPin" && c.engineId === pin.jobEngineId);
    if (!held && !reported) {
      out.push({ rule: "jobPin", engineId: pin.jobEngineId, date: pin.date, message: `a ${pin.kind} on ${pin.jobEngineId} is pinned to start ${pin.date} but the plan has no such job and no conflict` });
    }
  }
}

/** Every hard-rule violation in `plan` for `input`; an empty list means the plan may be used. */
export function checkPlan(input: PlannerInput, plan: CheckablePlan): Violation[] {
  const out: Violation[] = [];
  const entries = indexEntries(input);
  const engines = new Map(input.engines.map((e) => [e.id, e]));
  const runs = checkAssignments(input, plan, entries, engines, out);
  const jobs = checkJobsAndShop(input, plan.jobs, engines, out);
  const jobsByEngine = new Map<string, PlannedJob[]>();
  for (const job of jobs) {
    const list = jobsByEngine.get(job.engineId) ?? [];
    list.push(job);
    jobsByEngine.set(job.engineId, list);
  }
  for (const engine of input.engines) {
    const engineRuns = runs.get(engine.id) ?? [];
    checkDoubleBooking(engine.id, engineRuns, out);
    checkEngineSeason(input, engine, engineRuns, jobsByEngine.get(engine.id) ?? [], out);
  }
  checkPins(input, plan, entries, out);
  return out;
}
