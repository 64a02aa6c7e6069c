// Shapes shared by the rebuild planner, its checker, the fleet generator and the bench.
// Dates are ISO calendar days ('YYYY-MM-DD'); usage is in the organisation's usage unit
// (hours unless `usageUnit` says otherwise); shop labour is always in hours.

export type IsoDay = string;

export type JobKind = "topEnd" | "bottomEnd" | "inspection";
export const JOB_KINDS: readonly JobKind[] = ["topEnd", "bottomEnd", "inspection"];

export type EngineStatus = "running" | "bench" | "spare" | "retired";
export const ENGINE_STATUSES: readonly EngineStatus[] = ["running", "bench", "spare", "retired"];

/**
 * Which counters a finished job resets (common practice): a top end is torn down far enough to
 * count as an inspection; a bottom end means a full teardown, so the top end and the
 * inspection are renewed with it. Parts follow the kind they are renewed by.
 */
export const JOB_RESETS: Readonly<Record<JobKind, readonly JobKind[]>> = {
  inspection: ["inspection"],
  topEnd: ["topEnd", "inspection"],
  bottomEnd: ["bottomEnd", "topEnd", "inspection"],
};

/** Top-end and bottom-end jobs need parts (pistons, rings, cranks); an inspection does not. */
export const JOB_NEEDS_PARTS: Readonly<Record<JobKind, boolean>> = {
  topEnd: true,
  bottomEnd: true,
  inspection: false,
};

export interface EngineCounters {
  sinceTopEnd: number;
  sinceBottomEnd: number;
  sinceInspection: number;
}

export interface ServicePolicy {
  topEndLimit: number;
  bottomEndLimit?: number;
  inspectionInterval?: number;
  /** Share of a limit at which the engine is flagged "watch" on the calendar, 0 < f ≤ 1. */
  planFraction: number;
}

export interface PlannerEngine {
  id: string;
  name: string;
  /** Engine family: labour hours may be set per family in the shop. */
  family?: string;
  counters: EngineCounters;
  policy: ServicePolicy;
  chassisId: string | null;
  status: EngineStatus;
  /** An engine built for altitude must not run below this elevation (warning only). */
  builtForMinElevationM?: number;
  /** The engine cannot run or go on the bench before this day (away for machining, new build). */
  availableFrom?: IsoDay;
  /** Labour hours for this engine, overriding the family and shop defaults. */
  labourHours?: Partial<Record<JobKind, number>>;
}

/** A part with its own limit acts as one more counter on the engine it is fitted to. */
export interface PlannerPart {
  id: string;
  name: string;
  engineId: string;
  usage: number;
  limit: number;
  /** The job kind that renews the part (a piston: topEnd; a crank: bottomEnd). */
  renewedBy: JobKind;
}

export interface EventEntry {
  entryId: string;
  chassisId: string;
  expectedUsage: number;
  /** Only engines of this family fit the chassis; any engine may run it when absent. */
  engineFamily?: string;
}

export interface PlannerEvent {
  id: string;
  name: string;
  startDate: IsoDay;
  endDate: IsoDay;
  elevationM: number;
  important: boolean;
  entries: EventEntry[];
}

export interface ShopCalendar {
  /** Mechanic hours available per weekday, Monday first. */
  hoursPerWeekday: number[];
  closedDates: IsoDay[];
  /** Days before each event on which the crew travels and the shop is shut (default 1). */
  travelDaysBeforeEvent?: number;
  labourHours: Record<JobKind, number>;
  labourHoursByFamily?: Record<string, Partial<Record<JobKind, number>>>;
  /** Parts for a top end or bottom end ordered today arrive after this many days. */
  partsLeadDays: number;
}

export interface EntryPin {
  entryId: string;
  engineId: string;
}

export interface JobPin {
  jobEngineId: string;
  kind: JobKind;
  /** The day the job starts. */
  date: IsoDay;
}

export interface PlannerInput {
  /** Planning starts on this day: earlier events are history, earlier days have no shop time. */
  today: IsoDay;
  usageUnit?: string;
  engines: PlannerEngine[];
  parts?: PlannerPart[];
  events: PlannerEvent[];
  shop: ShopCalendar;
  entryPins?: EntryPin[];
  jobPins?: JobPin[];
}

export interface PlannedJob {
  id: string;
  engineId: string;
  kind: JobKind;
  startDate: IsoDay;
  endDate: IsoDay;
  labourHours: number;
  /** Labour booked per day; days inside the job without labour are absent. */
  hoursByDate: Record<IsoDay, number>;
  reason: string;
  pinned: boolean;
  /** The event the job prepares the engine for, when the planner made it for one. */
  forEventId: string | null;
}

export type ConflictKind =
  | "noEngine"
  | "shopCapacity"
  | "usageOverLimit"
  | "entryPin"
  | "jobPin";

export interface PlanConflict {
  kind: ConflictKind;
  entryId?: string;
  engineId?: string;
  eventId?: string;
  message: string;
}

export interface PlanWarning {
  kind: "altitude";
  entryId: string;
  engineId: string;
  eventId: string;
  message: string;
}

export interface PlanExplanation {
  subject: "entry" | "job";
  /** The entry id or the job id. */
  subjectId: string;
  engineId: string;
  text: string;
}

/** The day after which an engine's counter first reaches the policy's plan fraction. */
export interface WatchPoint {
  engineId: string;
  kind: JobKind;
  /** The counter's label: "top end", "bottom end", "inspection" or a part's name. */
  counter: string;
  date: IsoDay;
  usageAfter: number;
  limit: number;
}

export interface PlanStats {
  entryCount: number;
  assignedCount: number;
  conflictCount: number;
  /** Top-end plus bottom-end jobs, pinned ones included. */
  rebuildCount: number;
  inspectionCount: number;
  /** A proven minimum for rebuildCount when every entry is served (see lower-bound.ts). */
  lowerBound: number;
  /** Entries run by an engine other than the one in the chassis before the event. */
  engineMoves: number;
}

export interface RebuildPlan {
  assignments: Record<string, string>;
  /** Life left on the engine's tightest counter after the entry's event, per entry. */
  usageLeftAfter: Record<string, number>;
  jobs: PlannedJob[];
  conflicts: PlanConflict[];
  warnings: PlanWarning[];
  explanations: PlanExplanation[];
  watchPoints: WatchPoint[];
  stats: PlanStats;
}
