import { formatShortDay } from "./day-math";
import type { JobKind } from "./types";

// Plain-English sentences for each planner decision, with the numbers that drove it, so the
// calendar can show a manager why an engine went where it did and why a job sits on its day.

const JOB_NAMES: Record<JobKind, string> = {
  topEnd: "top end",
  bottomEnd: "bottom end",
  inspection: "inspection",
};

export function nameJobKind(kind: JobKind): string {
  return JOB_NAMES[kind];
}

/** 1.5 → "1.5", 4 → "4", 0.30000000000000004 → "0.3": never more than two decimals. */
export function formatAmount(value: number): string {
  const rounded = Math.round(value * 100) / 100;
  return String(Object.is(rounded, -0) ? 0 : rounded);
}

export interface EventRef {
  name: string;
  startDay: number;
}

const eventRefs = new WeakMap<EventRef, string>();

/** "the 14 Feb event (Harlow Lake II)"; remembered per event, as every entry quotes it. */
export function describeEventRef(event: EventRef): string {
  let text = eventRefs.get(event);
  if (text === undefined) {
    text = `the ${formatShortDay(event.startDay)} event (${event.name})`;
    eventRefs.set(event, text);
  }
  return text;
}

export type AssignmentReason = "pinned" | "kept" | "fitted" | "fresh" | "spread" | "rebuilt";

export interface AssignmentFacts {
  reason: AssignmentReason;
  engineName: string;
  chassisId: string;
  event: EventRef;
  usage: number;
  unit: string;
  lifeLeftBefore: number;
  /** The chassis the engine came from, when it moved. */
  fromChassisId: string | null;
  /** The engine that sat in the entry's chassis, when another engine was chosen. */
  displacedEngineName: string | null;
  displacedLifeLeft: number | null;
  /** The job the engine gets right before the event, if any. */
  jobKind: JobKind | null;
}

export function describeAssignment(f: AssignmentFacts): string {
  const u = f.unit;
  const head = `${f.engineName} runs chassis ${f.chassisId} at ${describeEventRef(f.event)} for ${formatAmount(f.usage)} ${u}`;
  const life = `${formatAmount(Math.max(0, f.lifeLeftBefore))} ${u} left`;
  let why: string;
  switch (f.reason) {
    case "pinned":
      why = f.jobKind
        ? `the manager pinned it here; it gets a ${nameJobKind(f.jobKind)} first`
        : `the manager pinned it here and it has ${life}`;
      break;
    case "kept":
      why = `it stays in its chassis and has ${life}, enough for the event`;
      break;
    case "fitted":
      why = `of the free engines it has the least life that still covers the entry (${life}), which keeps fresher engines for later`;
      break;
    case "fresh":
      why = `the event is marked important and it is the freshest free engine (${life})`;
      break;
    case "spread":
      why = `near the end of the season the engines with the most life run first (${life}), so that none ends the season holding life another engine needed`;
      break;
    case "rebuilt":
      why = `no free engine had ${formatAmount(f.usage)} ${u} left, so it gets a ${nameJobKind(f.jobKind ?? "topEnd")} first; it threw away the least usable life (${life})`;
      break;
  }
  const bench = f.jobKind && f.reason !== "rebuilt" && f.reason !== "pinned" ? ` Its ${nameJobKind(f.jobKind)} is done just before.` : "";
  const moved = f.fromChassisId ? ` It moves from chassis ${f.fromChassisId}.` : "";
  const displaced =
    f.displacedEngineName !== null && f.displacedLifeLeft !== null
      ? ` The chassis's own engine ${f.displacedEngineName} had ${formatAmount(Math.max(0, f.displacedLifeLeft))} ${u} left.`
      : "";
  return `${head}: ${why}.${bench}${moved}${displaced}`;
}

export interface JobFacts {
  kind: JobKind;
  engineName: string;
  unit: string;
  /** Tightest counter before the job: its label, use and limit. */
  counterLabel: string;
  counterUsed: number;
  counterLimit: number;
  chassisId: string;
  event: EventRef;
  usage: number;
  upgraded: boolean;
}

export function describeJobReason(f: JobFacts): string {
  const u = f.unit;
  const base = `${nameJobKind(f.kind)} before ${describeEventRef(f.event)}: ${f.counterLabel} at ${formatAmount(f.counterUsed)} of ${formatAmount(f.counterLimit)} ${u}, and chassis ${f.chassisId} needs ${formatAmount(f.usage)} ${u} there`;
  return f.upgraded
    ? `${base}; a bottom end now because the bottom end would run out before the next top end did`
    : base;
}

export function describePinnedJobReason(kind: JobKind, day: number): string {
  return `${nameJobKind(kind)} pinned by the manager to start ${formatShortDay(day)}`;
}

export function describeJobBooking(reason: string, labourHours: number, days: number[], planned: boolean): string {
  const span =
    days.length === 1
      ? `on ${formatShortDay(days[0])}`
      : `from ${formatShortDay(days[0])} to ${formatShortDay(days[days.length - 1])}`;
  const when = planned ? "as late as the shop's free hours allow" : "from the pinned day on";
  return `${reason}. ${formatAmount(labourHours)} h of labour booked ${span}, ${when}.`;
}

export interface ShortfallFacts {
  chassisId: string;
  event: EventRef;
  usage: number;
  unit: string;
  /** Most free labour any candidate engine's window before the event holds. */
  freeHours: number;
  jobKind: JobKind;
  jobHours: number;
  /** Set when parts ordered today arrive after the window opens. */
  partsReadyDay: number | null;
}

export function describeShortfall(f: ShortfallFacts): string {
  const parts = f.partsReadyDay !== null ? ` (parts arrive ${formatShortDay(f.partsReadyDay)})` : "";
  return `no engine has ${formatAmount(f.usage)} ${f.unit} left for chassis ${f.chassisId} at ${describeEventRef(f.event)}, and the shop has ${formatAmount(f.freeHours)} h free before it${parts}; the ${nameJobKind(f.jobKind)} needs ${formatAmount(f.jobHours)} h`;
}

export function describeNoFreeEngine(chassisId: string, event: EventRef, usableEngines: number): string {
  return `no engine is free for chassis ${chassisId} at ${describeEventRef(event)}: all ${usableEngines} usable engines are entered elsewhere, on the bench or not yet available`;
}

export function describeUsageOverLimit(chassisId: string, event: EventRef, usage: number, unit: string, largestLimit: number): string {
  return `chassis ${chassisId} needs ${formatAmount(usage)} ${unit} at ${describeEventRef(event)}, more than a fresh engine among the free ones can run (largest limit ${formatAmount(largestLimit)} ${unit})`;
}

export function describeAltitudeWarning(engineName: string, minElevationM: number, event: EventRef, elevationM: number): string {
  return `${engineName} is built for ${formatAmount(minElevationM)} m and up but runs at ${describeEventRef(event)} at ${formatAmount(elevationM)} m: check compression and fuel before it runs`;
}
