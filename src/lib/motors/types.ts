import type { SetFigures } from "./reading-figures.ts";
import type {
  CHASSIS_KINDS,
  ENGINE_CYCLES,
  ENGINE_STATUSES,
  METER_KINDS,
  PART_EVENT_KINDS,
  PART_KINDS,
  SERVICE_KINDS,
  SET_KINDS,
  USAGE_SOURCES,
} from "../schemas/motors.ts";

// The shapes the motors API answers with (docs/api-motors.md). Plain data: islands may import
// these types; dates are "YYYY-MM-DD", instants ISO 8601 in UTC, usage in the organisation's unit.

export type EngineStatus = (typeof ENGINE_STATUSES)[number];
export type EngineCycle = (typeof ENGINE_CYCLES)[number];
export type ChassisKind = (typeof CHASSIS_KINDS)[number];
export type MeterKind = (typeof METER_KINDS)[number];
export type PartKind = (typeof PART_KINDS)[number];
export type PartEventKind = (typeof PART_EVENT_KINDS)[number];
export type UsageSource = (typeof USAGE_SOURCES)[number];
export type ServiceKind = (typeof SERVICE_KINDS)[number];
export type SetKind = (typeof SET_KINDS)[number];
export type UsageUnit = "hours" | "kilometres" | "laps" | "litres";

export interface PersonRef {
  id: string;
  name: string;
}

export interface RacingClass {
  id: number;
  name: string;
  minSquishMm: number | null;
  minChamberCc: number | null;
  minFlatPlateCc: number | null;
  maxDisplacementCc: number | null;
  squishWireNote: string | null;
  notes: string | null;
  archivedAt: string | null;
}

export interface Engine {
  id: number;
  name: string;
  serial: string | null;
  cycle: EngineCycle;
  cylinders: number;
  boreMm: number;
  strokeMm: number;
  rodMm: number | null;
  exhaustOpensDegAtdc: number | null;
  targetRatio: number | null;
  targetSquishMm: number | null;
  buildFuelNote: string | null;
  buildMinOctane: number | null;
  builtForMinElevationM: number | null;
  builtForMaxElevationM: number | null;
  racingClassId: number | null;
  status: EngineStatus;
  notes: string | null;
  topEndLimit: number | null;
  bottomEndLimit: number | null;
  inspectionInterval: number | null;
  planFraction: number;
  archivedAt: string | null;
  createdAt: string;
  updatedAt: string;
  /** From bore and stroke (computed, never stored). */
  sweptCc: number;
  displacementCc: number;
}

/** "fine" below planFraction of the limit, "watch" from there, "act" at or past the limit. */
export type CounterLevel = "fine" | "watch" | "act";

export interface IntervalCounter {
  used: number;
  limit: number | null;
  /** used / limit; null without a limit. */
  share: number | null;
  level: CounterLevel | null;
  /** The latest service of this kind (top end, bottom end, inspection); null when none. */
  lastOn: string | null;
}

export interface EngineCounters {
  unit: UsageUnit;
  sinceNew: number;
  topEnd: IntervalCounter;
  bottomEnd: IntervalCounter;
  inspection: IntervalCounter;
}

export interface PartCounters {
  unit: UsageUnit;
  /** Carried-over usage plus usage in every engine the part has been in. */
  sinceNew: number;
  /** Since the part went into its current engine; null on the shelf. */
  inCurrentEngine: number | null;
  /** In its current engine since that engine's last top end / bottom end; null on the shelf. */
  sinceTopEnd: number | null;
  sinceBottomEnd: number | null;
  life: IntervalCounter;
}

export interface ChassisRef {
  id: number;
  number: string;
  kind: ChassisKind;
  meterKind: MeterKind;
}

export interface LatestReadingSummary {
  readingSetId: number;
  takenOn: string;
  setKind: SetKind;
  isBaseline: boolean;
  maxGeometricRatio: number | null;
  maxTrappedRatio: number | null;
  minSquishMeanMm: number | null;
  chamberSpreadCc: number | null;
  unconfirmedCylinders: number[];
  compliant: boolean | null;
}

export interface RosterRow {
  id: number;
  name: string;
  serial: string | null;
  status: EngineStatus;
  cycle: EngineCycle;
  cylinders: number;
  displacementCc: number;
  racingClass: { id: number; name: string } | null;
  chassis: ChassisRef | null;
  counters: EngineCounters;
  latestReading: LatestReadingSummary | null;
  archivedAt: string | null;
  updatedAt: string;
}

export interface Roster {
  engines: RosterRow[];
  page: number;
  perPage: number;
  total: number;
  unit: UsageUnit;
}

export interface Installation {
  id: number;
  engineId: number;
  engineName: string;
  chassisId: number;
  chassisNumber: string;
  installedAt: string;
  removedAt: string | null;
  meterAtInstall: number | null;
  meterAtRemoval: number | null;
  notes: string | null;
}

export interface Chassis {
  id: number;
  number: string;
  kind: ChassisKind;
  meterKind: MeterKind;
  notes: string | null;
  archivedAt: string | null;
  current: Installation | null;
  /** The last meter value known for this chassis (install, reading or removal). */
  lastMeterReading: number | null;
}

export interface Part {
  id: number;
  serial: string;
  kind: PartKind;
  description: string | null;
  engineId: number | null;
  engineName: string | null;
  cylinderNo: number | null;
  usageLimit: number | null;
  initialUsage: number;
  maxTotalCutMm: number | null;
  maxOversizeMm: number | null;
  totalCutMm: number;
  oversizeMm: number;
  notes: string | null;
  archivedAt: string | null;
  counters: PartCounters;
}

export interface PartMove {
  id: number;
  partId: number;
  fromEngineId: number | null;
  fromEngineName: string | null;
  toEngineId: number | null;
  toEngineName: string | null;
  toCylinderNo: number | null;
  movedOn: string;
  notes: string | null;
  movedBy: PersonRef | null;
}

export interface PartEvent {
  id: number;
  partId: number;
  kind: PartEventKind;
  amountMm: number;
  totalAfterMm: number;
  doneOn: string;
  engineId: number | null;
  notes: string | null;
  doneBy: PersonRef | null;
}

export interface UsageEntry {
  id: number;
  engineId: number;
  engineName: string;
  occurredOn: string;
  amount: number;
  unit: UsageUnit;
  source: UsageSource;
  sessionLabel: string | null;
  eventLabel: string | null;
  meterReading: number | null;
  installationId: number | null;
  notes: string | null;
  loggedBy: PersonRef | null;
  archivedAt: string | null;
  createdAt: string;
}

export interface ServiceRecord {
  id: number;
  engineId: number;
  kind: ServiceKind;
  doneOn: string;
  jobId: number | null;
  notes: string | null;
  doneBy: PersonRef | null;
  archivedAt: string | null;
  createdAt: string;
}

export interface CylinderReading {
  cylinderNo: number;
  chamberReadingsCc: number[];
  flatPlateCc: number | null;
  squishAMm: number | null;
  squishBMm: number | null;
  crankingKpa: number | null;
  leakdownPct: number | null;
  notes: string | null;
}

export interface Upload {
  id: number;
  engineId: number | null;
  readingSetId: number | null;
  cylinderNo: number | null;
  contentType: string;
  byteSize: number;
  originalName: string;
  caption: string | null;
  url: string;
  thumbnailUrl: string | null;
  uploadedBy: PersonRef | null;
  createdAt: string;
  archivedAt: string | null;
}

export interface ReadingSet {
  id: number;
  engineId: number;
  engineName: string;
  takenOn: string;
  takenBy: PersonRef | null;
  elevationM: number;
  airTempC: number | null;
  methodNotes: string | null;
  isBaseline: boolean;
  setKind: SetKind;
  archivedAt: string | null;
  createdAt: string;
  /** The engine's counters as of the end of takenOn. */
  usageAtReading: { sinceNew: number; sinceTopEnd: number; sinceBottomEnd: number };
  cylinders: CylinderReading[];
  figures: SetFigures;
  uploads: Upload[];
}

export type TimelineKind =
  | "installed"
  | "removed"
  | "usage"
  | "service"
  | "reading_set"
  | "part_in"
  | "part_out"
  | "part_cut"
  | "part_oversize";

export interface TimelineItem {
  kind: TimelineKind;
  /** The calendar day in the organisation's time zone. */
  on: string;
  /** For installs and removals: the instant. */
  at: string | null;
  id: number;
  summary: string;
  details: Record<string, string | number | boolean | null>;
}
