import { formatDayNumber, formatShortDay } from "./day-math";
import { applyJob, type EngineState } from "./engine-state";
import { describeJobBooking, describePinnedJobReason, formatAmount, nameJobKind } from "./explain";
import type { NormEvent } from "./normalize-input";
import type { PlanContext } from "./plan-context";
import { bookEarliest, bookForward, describeDayBlock, shiftLatest, sumFreeCenti, type DayBlock, type DayLabour } from "./shop-capacity";
import { JOB_NEEDS_PARTS, type JobKind, type PlannedJob } from "./types";

// Fits jobs into the shop. A planned job is first booked as early as its engine allows (that
// never costs another job its fit) and, once the season is planned, slid as late as possible
// before the event that needs it. A pinned job starts on its day and runs forward.

export type JobAttempt =
  | { ok: true; kind: JobKind; job: PlannedJob }
  | { ok: false; kind: JobKind; freeCenti: number; labourCenti: number; partsReadyDay: number | null };

function findWindowStart(ctx: PlanContext, state: EngineState, kind: JobKind): { lo: number; partsReadyDay: number | null } {
  const engineFree = Math.max(state.busyUntil + 1, state.norm.availableFromDay, ctx.norm.todayDay);
  const partsDay = JOB_NEEDS_PARTS[kind] ? ctx.norm.todayDay + ctx.norm.partsLeadDays : ctx.norm.todayDay;
  return { lo: Math.max(engineFree, partsDay), partsReadyDay: partsDay > engineFree ? partsDay : null };
}

function recordBooking(ctx: PlanContext, state: EngineState, kind: JobKind, booked: DayLabour[], window: { lo: number; hi: number } | null, reason: string, forEventId: string | null): PlannedJob {
  const job: PlannedJob = {
    id: forEventId === null ? `${state.norm.id}:${kind}:pinned:${formatDayNumber(booked[0].day)}` : `${state.norm.id}:${kind}:${forEventId}`,
    engineId: state.norm.id,
    kind,
    startDate: "",
    endDate: "",
    labourHours: state.norm.labourCenti[kind] / 100,
    hoursByDate: {},
    reason,
    pinned: forEventId === null,
    forEventId,
  };
  ctx.bookings.push({
    job,
    engineName: state.norm.name,
    booked,
    windowStartDay: window ? window.lo : booked[0].day,
    windowEndDay: window ? window.hi : booked[booked.length - 1].day,
    movable: window !== null,
  });
  return job;
}

/**
 * Once every event is planned, slides each planned job as late as its window allows, latest
 * deadline first, so rebuilds happen just before they are needed without giving up a fit; then
 * writes the final days onto each job and explains it.
 */
export function settleJobs(ctx: PlanContext): PlannedJob[] {
  const movable = ctx.bookings
    .filter((b) => b.movable)
    .sort((a, b) => b.windowEndDay - a.windowEndDay || (a.job.id < b.job.id ? -1 : 1));
  for (const b of movable) b.booked = shiftLatest(ctx.shop, b.booked, b.windowStartDay, b.windowEndDay);
  for (const b of ctx.bookings) {
    const hoursByDate: Record<string, number> = {};
    for (const d of b.booked) hoursByDate[formatDayNumber(d.day)] = d.centi / 100;
    b.job.hoursByDate = hoursByDate;
    b.job.startDate = formatDayNumber(b.booked[0].day);
    b.job.endDate = formatDayNumber(b.booked[b.booked.length - 1].day);
    ctx.explanations.push({
      subject: "job",
      subjectId: b.job.id,
      engineId: b.job.engineId,
      text: describeJobBooking(b.job.reason, b.job.labourHours, b.booked.map((d) => d.day), b.movable),
    });
  }
  return ctx.bookings
    .map((b) => b.job)
    .sort((a, b) => (a.startDate < b.startDate ? -1 : a.startDate > b.startDate ? 1 : a.id < b.id ? -1 : 1));
}

/**
 * Tries each job kind in turn and books the first that fits before the event. `reasonFor`
 * writes the job's reason once the kind is known. On failure, reports the most free labour
 * seen so a conflict can quote it.
 */
export function tryBookJob(ctx: PlanContext, state: EngineState, kinds: JobKind[], event: NormEvent, reasonFor: (kind: JobKind) => string): JobAttempt {
  let failure: JobAttempt | null = null;
  for (const kind of kinds) {
    const labourCenti = state.norm.labourCenti[kind];
    const { lo, partsReadyDay } = findWindowStart(ctx, state, kind);
    const hi = event.startDay - 1;
    const booked = hi >= lo ? bookEarliest(ctx.shop, lo, hi, labourCenti) : null;
    if (booked) {
      const job = recordBooking(ctx, state, kind, booked, { lo, hi }, reasonFor(kind), event.id);
      // The job may still slide anywhere up to `hi`: no other job on this engine may start
      // before then.
      applyJob(state, kind, hi);
      state.lastJob = { kind, forEventId: event.id };
      return { ok: true, kind, job };
    }
    const freeCenti = hi >= lo ? sumFreeCenti(ctx.shop, lo, hi) : 0;
    if (!failure || (!failure.ok && freeCenti > failure.freeCenti)) {
      failure = { ok: false, kind, freeCenti, labourCenti, partsReadyDay };
    }
  }
  if (!failure) throw new RangeError("tryBookJob needs at least one job kind");
  return failure;
}

function explainPinnedJobRefusal(ctx: PlanContext, state: EngineState, kind: JobKind, day: number): string | null {
  const what = `the pinned ${nameJobKind(kind)} on ${state.norm.name} for ${formatShortDay(day)}`;
  if (state.norm.retired) return `${what} cannot hold: the engine is retired`;
  if (day < ctx.norm.todayDay) return `${what} cannot hold: the day has passed`;
  if (day < state.norm.availableFromDay) {
    return `${what} cannot hold: the engine is not available until ${formatShortDay(state.norm.availableFromDay)}`;
  }
  if (JOB_NEEDS_PARTS[kind] && day < ctx.norm.todayDay + ctx.norm.partsLeadDays) {
    return `${what} cannot hold: parts ordered today arrive ${formatShortDay(ctx.norm.todayDay + ctx.norm.partsLeadDays)}`;
  }
  const blockedBy = describeDayBlock(ctx.shop, day);
  if (blockedBy !== "open") {
    const eventName = ctx.shop.blockingEvent.get(day);
    const because: Record<DayBlock, string> = {
      open: "",
      past: "the day has passed",
      closed: "the shop is closed that day",
      noHours: "the shop has no hours on that weekday",
      event: `it is an event day (${eventName ?? "event"})`,
      travel: `it is a travel day before ${eventName ?? "an event"}`,
    };
    return `${what} cannot hold: ${because[blockedBy]}`;
  }
  const overlapping = state.pinnedJobs.find((slot) => slot.endDay >= day);
  if (overlapping) return `${what} cannot hold: the engine is still on the bench for another pinned job`;
  return null;
}

function compareText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/** Books every pinned job before planning, so planned work fits around the manager's choices. */
export function placePinnedJobs(ctx: PlanContext): void {
  const pins = [...ctx.norm.jobPins].sort(
    (a, b) =>
      a.day - b.day ||
      compareText(ctx.engines[a.engineIndex].norm.id, ctx.engines[b.engineIndex].norm.id) ||
      compareText(a.kind, b.kind),
  );
  for (const pin of pins) {
    const state = ctx.engines[pin.engineIndex];
    const labourCenti = state.norm.labourCenti[pin.kind];
    let refusal = explainPinnedJobRefusal(ctx, state, pin.kind, pin.day);
    const booked = refusal === null ? bookForward(ctx.shop, pin.day, labourCenti) : null;
    if (refusal === null && booked === null) {
      refusal = `the pinned ${nameJobKind(pin.kind)} on ${state.norm.name} for ${formatShortDay(pin.day)} cannot hold: the shop has only ${formatAmount(sumFreeCenti(ctx.shop, pin.day, ctx.shop.lastDay) / 100)} h free from that day on, and the job needs ${formatAmount(labourCenti / 100)} h`;
    }
    if (refusal !== null || booked === null) {
      ctx.conflicts.push({ kind: "jobPin", engineId: state.norm.id, message: refusal ?? "" });
      continue;
    }
    recordBooking(ctx, state, pin.kind, booked, null, describePinnedJobReason(pin.kind, pin.day), null);
    state.pinnedJobs.push({ kind: pin.kind, startDay: booked[0].day, endDay: booked[booked.length - 1].day, applied: false });
  }
}
