import { buildShopView, isIsoDay, shiftIsoDay } from "./check-shop-days";
import type { JobKind, PlannedJob, PlannerEngine, PlannerEvent, PlannerInput } from "./types";

// Checker rules about jobs and engine limits. Written apart from the planner on purpose: its
// own reset table, its own limit simulation, its own calendar.

export type ViolationRule =
  | "unknownReference"
  | "retiredEngine"
  | "engineUnavailable"
  | "wrongFamily"
  | "unplannedEntry"
  | "conflictedButAssigned"
  | "limitPassed"
  | "doubleBooked"
  | "jobOverlapsEvent"
  | "jobOverlapsJob"
  | "shopOverCapacity"
  | "jobOnClosedDay"
  | "jobLabour"
  | "partsLead"
  | "entryPin"
  | "jobPin";

export interface Violation {
  rule: ViolationRule;
  message: string;
  entryId?: string;
  engineId?: string;
  jobId?: string;
  date?: string;
}

/** Tolerance for decimal sums: a plan may sit on a limit, never over it by more than this. */
const TOLERANCE = 1e-6;

/** Numbers in messages: 7.8, not 7.800000000000001. */
function show(x: number): string {
  return String(Math.round(x * 1000) / 1000);
}

/** What each job renews (the product's rule: a bottom end is a full teardown). */
const RENEWS: Record<JobKind, JobKind[]> = {
  inspection: ["inspection"],
  topEnd: ["inspection", "topEnd"],
  bottomEnd: ["inspection", "topEnd", "bottomEnd"],
};

export interface EngineRun {
  entryId: string;
  event: PlannerEvent;
  usage: number;
}

function expectLabour(input: PlannerInput, engine: PlannerEngine, kind: JobKind): number {
  const own = engine.labourHours?.[kind];
  if (own !== undefined) return own;
  const fam = engine.family !== undefined ? input.shop.labourHoursByFamily?.[engine.family]?.[kind] : undefined;
  return fam ?? input.shop.labourHours[kind];
}

function checkJobShape(input: PlannerInput, job: PlannedJob, engine: PlannerEngine, out: Violation[]): boolean {
  const base = { engineId: job.engineId, jobId: job.id };
  const days = Object.keys(job.hoursByDate ?? {}).sort();
  if (!RENEWS[job.kind] || !isIsoDay(job.startDate) || !isIsoDay(job.endDate) || days.length === 0 || !days.every(isIsoDay)) {
    out.push({ rule: "jobLabour", ...base, message: `job ${job.id} has an unknown kind, a bad date or no labour days` });
    return false;
  }
  let sum = 0;
  for (const day of days) {
    const h = job.hoursByDate[day];
    if (typeof h !== "number" || !Number.isFinite(h) || h <= 0) {
      out.push({ rule: "jobLabour", ...base, date: day, message: `job ${job.id} books ${String(h)} h on ${day}` });
    } else sum += h;
  }
  if (days[0] !== job.startDate || days[days.length - 1] !== job.endDate) {
    out.push({ rule: "jobLabour", ...base, message: `job ${job.id} runs ${job.startDate}–${job.endDate} but books labour ${days[0]}–${days[days.length - 1]}` });
  }
  const expected = expectLabour(input, engine, job.kind);
  if (Math.abs(sum - job.labourHours) > 0.005 + TOLERANCE || Math.abs(job.labourHours - expected) > 0.005 + TOLERANCE) {
    out.push({ rule: "jobLabour", ...base, message: `job ${job.id} books ${show(sum)} h for ${show(job.labourHours)} h of labour; a ${job.kind} on ${engine.id} takes ${show(expected)} h` });
  }
  return true;
}

function checkJobDates(input: PlannerInput, job: PlannedJob, engine: PlannerEngine, out: Violation[]): void {
  const base = { engineId: job.engineId, jobId: job.id };
  if (engine.status === "retired") out.push({ rule: "retiredEngine", ...base, message: `job ${job.id} is on retired engine ${engine.id}` });
  if (engine.availableFrom !== undefined && job.startDate < engine.availableFrom) {
    out.push({ rule: "engineUnavailable", ...base, message: `job ${job.id} starts ${job.startDate}, before ${engine.id} is available on ${engine.availableFrom}` });
  }
  if (job.kind !== "inspection") {
    const partsDay = shiftIsoDay(input.today, input.shop.partsLeadDays);
    if (job.startDate < partsDay) {
      out.push({ rule: "partsLead", ...base, message: `job ${job.id} starts ${job.startDate}, but parts ordered today arrive ${partsDay}` });
    }
  }
}

/** Every labour day must be open, and no day may carry more labour than the shop has. */
export function checkJobsAndShop(input: PlannerInput, jobs: PlannedJob[], engines: Map<string, PlannerEngine>, out: Violation[]): PlannedJob[] {
  const shop = buildShopView(input);
  const perDay = new Map<string, number>();
  const sound: PlannedJob[] = [];
  for (const job of jobs) {
    const engine = engines.get(job.engineId);
    if (!engine) {
      out.push({ rule: "unknownReference", jobId: job.id, message: `job ${job.id} names unknown engine ${job.engineId}` });
      continue;
    }
    if (!checkJobShape(input, job, engine, out)) continue;
    checkJobDates(input, job, engine, out);
    for (const [day, hours] of Object.entries(job.hoursByDate)) {
      const why = shop.whyClosed(day);
      if (why !== null) out.push({ rule: "jobOnClosedDay", engineId: job.engineId, jobId: job.id, date: day, message: `job ${job.id} books ${hours} h on ${day}, ${why}` });
      perDay.set(day, (perDay.get(day) ?? 0) + hours);
    }
    sound.push(job);
  }
  for (const [day, hours] of [...perDay.entries()].sort()) {
    const capacity = shop.hoursOn(day);
    if (hours > capacity + TOLERANCE) {
      out.push({ rule: "shopOverCapacity", date: day, message: `${day} carries ${show(hours)} h of labour but the shop has ${show(capacity)} h` });
    }
  }
  return sound;
}

interface LimitCounter {
  name: string;
  renewedBy: JobKind;
  limit: number;
  used: number;
}

function listCounters(input: PlannerInput, engine: PlannerEngine): LimitCounter[] {
  const p = engine.policy;
  const list: LimitCounter[] = [{ name: "top end", renewedBy: "topEnd", limit: p.topEndLimit, used: engine.counters.sinceTopEnd }];
  if (p.bottomEndLimit !== undefined) list.push({ name: "bottom end", renewedBy: "bottomEnd", limit: p.bottomEndLimit, used: engine.counters.sinceBottomEnd });
  if (p.inspectionInterval !== undefined) list.push({ name: "inspection", renewedBy: "inspection", limit: p.inspectionInterval, used: engine.counters.sinceInspection });
  for (const part of input.parts ?? []) {
    if (part.engineId === engine.id) list.push({ name: `part ${part.id}`, renewedBy: part.renewedBy, limit: part.limit, used: part.usage });
  }
  return list;
}

/**
 * Replays one engine's season: jobs that end before an event renew their counters first; at
 * every event each counter plus the event's usage must stay within its limit. Also flags jobs
 * that overlap the engine's events or each other.
 */
export function checkEngineSeason(input: PlannerInput, engine: PlannerEngine, runs: EngineRun[], jobs: PlannedJob[], out: Violation[]): void {
  const counters = listCounters(input, engine);
  const byEnd = [...jobs].sort((a, b) => (a.endDate < b.endDate ? -1 : a.endDate > b.endDate ? 1 : 0));
  for (let i = 1; i < byEnd.length; i++) {
    for (let j = 0; j < i; j++) {
      if (byEnd[j].startDate <= byEnd[i].endDate && byEnd[i].startDate <= byEnd[j].endDate) {
        out.push({ rule: "jobOverlapsJob", engineId: engine.id, jobId: byEnd[i].id, message: `jobs ${byEnd[j].id} and ${byEnd[i].id} on ${engine.id} overlap` });
      }
    }
  }
  const ordered = [...runs].sort((a, b) => (a.event.startDate < b.event.startDate ? -1 : a.event.startDate > b.event.startDate ? 1 : 0));
  let next = 0;
  for (const run of ordered) {
    for (const job of byEnd) {
      if (job.startDate <= run.event.endDate && run.event.startDate <= job.endDate) {
        out.push({ rule: "jobOverlapsEvent", engineId: engine.id, jobId: job.id, entryId: run.entryId, message: `job ${job.id} on ${engine.id} (${job.startDate}–${job.endDate}) overlaps ${run.event.name}, which it runs` });
      }
    }
    while (next < byEnd.length && byEnd[next].endDate < run.event.startDate) {
      const renews = RENEWS[byEnd[next].kind];
      for (const c of counters) if (renews.includes(c.renewedBy)) c.used = 0;
      next += 1;
    }
    for (const c of counters) {
      if (c.used + run.usage > c.limit + TOLERANCE) {
        out.push({ rule: "limitPassed", engineId: engine.id, entryId: run.entryId, message: `${engine.id} would pass its ${c.name} limit at ${run.event.name}: ${show(c.used)} + ${show(run.usage)} > ${show(c.limit)}` });
      }
      c.used += run.usage;
    }
  }
}
