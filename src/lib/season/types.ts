// The shapes the season, plan and bench API answers with. Plain data: islands import these
// types. Days are "YYYY-MM-DD", instants ISO 8601 in UTC, usage in the organisation's unit.

export const JOB_KIND_VALUES = ["top_end", "bottom_end", "inspection"] as const;
export type BenchJobKind = (typeof JOB_KIND_VALUES)[number];
export const JOB_STATE_VALUES = ["planned", "in_progress", "done", "cancelled"] as const;
export type JobState = (typeof JOB_STATE_VALUES)[number];
export type EventKind = "practice" | "race" | "test";

export const JOB_KIND_LABELS: Record<BenchJobKind, string> = {
  top_end: "Top end",
  bottom_end: "Bottom end",
  inspection: "Inspection",
};

export const JOB_STATE_LABELS: Record<JobState, string> = {
  planned: "Planned",
  in_progress: "On the bench",
  done: "Done",
  cancelled: "Cancelled",
};

export interface PersonName {
  id: string;
  name: string;
}

export interface SeasonEntry {
  id: number;
  eventId: number;
  chassisId: number;
  chassisNumber: string;
  expectedUsage: number;
  engineId: number | null;
  engineName: string | null;
  pinned: boolean;
  /** Life left on the engine's tightest counter after this event, from the accepted plan. */
  usageLeftAfter: number | null;
  fuelRun: string | null;
  fuelDecidedBy: PersonName | null;
  fuelDecidedAt: string | null;
}

export interface SeasonEvent {
  id: number;
  name: string;
  venue: string | null;
  startsOn: string;
  endsOn: string;
  elevationM: number;
  expectedAirTempC: number | null;
  kind: EventKind;
  important: boolean;
  notes: string | null;
  archived: boolean;
  entries: SeasonEntry[];
}

export interface ChecklistItem {
  item: string;
  done: boolean;
}

export interface JobPart {
  id: number;
  partId: number | null;
  partLabel: string | null;
  description: string;
  quantity: number;
}

export interface BenchJob {
  id: number;
  engineId: number;
  engineName: string;
  chassisNumber: string | null;
  kind: BenchJobKind;
  state: JobState;
  startsOn: string;
  endsOn: string;
  hoursByDate: Record<string, number>;
  labourHoursPlanned: number;
  labourHoursActual: number | null;
  pinned: boolean;
  forEventId: number | null;
  forEventName: string | null;
  reason: string | null;
  checklist: ChecklistItem[];
  parts: JobPart[];
  assignedTo: PersonName | null;
  doneBy: PersonName | null;
  doneOn: string | null;
  notes: string | null;
}

export interface ShopSettings {
  /** Mechanic hours per weekday, Monday first. */
  hoursPerWeekday: number[];
  travelDaysBeforeEvent: number;
  topEndHours: number;
  bottomEndHours: number;
  inspectionHours: number;
  partsLeadDays: number;
  /** True while the organisation has not saved its own settings. */
  isDefault: boolean;
}

export interface ClosedDay {
  id: number;
  day: string;
  reason: string | null;
}

export interface PlanNote {
  kind: string;
  message: string;
  entryId?: number;
  engineId?: number;
  eventId?: number;
}

export interface WatchPointView {
  engineId: number;
  engineName: string;
  kind: BenchJobKind;
  counter: string;
  date: string;
  usageAfter: number;
  limit: number;
}

export interface PlanEngine {
  id: number;
  name: string;
  chassisNumber: string | null;
  status: string;
}

export interface SeasonPlanView {
  today: string;
  usageUnit: string;
  plannedAt: string | null;
  plannedFrom: string | null;
  events: SeasonEvent[];
  jobs: BenchJob[];
  watchPoints: WatchPointView[];
  conflicts: PlanNote[];
  warnings: PlanNote[];
  /** Why each entry has its engine and each job sits on its day, keyed by entry or job id. */
  explanations: { entries: Record<string, string>; jobs: Record<string, string> };
  /** What no longer holds in the accepted plan against today's data (re-plan to fix). */
  checks: string[];
  /** Engines left out of planning, and why. */
  notes: string[];
  closedDays: ClosedDay[];
  shop: ShopSettings;
  engines: PlanEngine[];
  stats: { rebuildCount: number; lowerBound: number; inspectionCount: number; entryCount: number; assignedCount: number } | null;
}

export interface AssignmentChange {
  entryId: number;
  eventId: number;
  eventName: string;
  startsOn: string;
  chassisNumber: string;
  from: string | null;
  to: string | null;
}

export interface JobChange {
  engineName: string;
  kind: BenchJobKind;
  startsOn: string;
  endsOn: string;
  /** For a moved job: where it was. */
  fromStartsOn?: string;
  forEventName: string | null;
}

export interface PlanDiff {
  /** A fingerprint of what the plan was computed from; accept with it to be sure nothing changed. */
  basis: string;
  today: string;
  assignments: AssignmentChange[];
  jobsAdded: JobChange[];
  jobsRemoved: JobChange[];
  jobsMoved: JobChange[];
  conflicts: PlanNote[];
  warnings: PlanNote[];
  stats: { rebuildCount: number; lowerBound: number; inspectionCount: number };
  unchanged: boolean;
}

export interface FuelCheckView {
  engineId: number;
  engineName: string;
  /** Null when the engine lacks what the check needs; `note` says what. */
  check: {
    chamberCc: number;
    chamberTakenOn: string;
    geometricRatio: number;
    trappedRatio: number | null;
    ratioBasis: "trapped" | "geometric";
    airTempC: number;
    densityAltitudeM: number;
    crankingKpaEstimate: number;
    fuelGrade: string | null;
    marginKpa: number;
    fuelTableLabel: string;
    riskFlags: { code: string; message: string }[];
  } | null;
  note: string | null;
}

export interface EventDetail {
  event: SeasonEvent;
  usageUnit: string;
  fuelChecks: FuelCheckView[];
  cautions: string[];
  explanations: Record<string, string>;
}
