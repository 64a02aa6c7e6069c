import { CAUTION_FUEL_FIRE_CODES, COMPRESSION_CAUTIONS } from "../../lib/domain/cautions.ts";
import { formatQuantity, type UnitChoice } from "../../lib/domain/units.ts";
import type { Engine, EngineCounters, Installation, Part, RacingClass, ReadingSet, TimelineItem, UsageUnit } from "../../lib/motors/types.ts";
import { getEngineTimeline } from "./engine-timeline-service.ts";
import { getEngineFile } from "./engines-service.ts";
import { dayIn, loadOrgSettings } from "./motors-common.ts";

// The build sheet of one engine, for tech inspection or a customer: the same data for the
// printable page and the PDF, with every value already worded in the reader's units.

const HISTORY_MAX = 40;
const EVENTS_MAX = 20;

export interface SheetLine {
  label: string;
  value: string;
}

export interface UsageByEvent {
  label: string;
  from: string;
  to: string;
  amount: number;
}

export interface BuildSheet {
  organisationName: string;
  printedOn: string;
  unit: UsageUnit;
  engine: Engine;
  racingClass: RacingClass | null;
  installation: Installation | null;
  counters: EngineCounters;
  spec: SheetLine[];
  latest: ReadingSet | null;
  baseline: ReadingSet | null;
  history: TimelineItem[];
  historyTotal: number;
  usageByEvent: UsageByEvent[];
  parts: Part[];
  cautions: string[];
  signatures: string[];
}

const CYCLE = { two_stroke: "two-stroke", four_stroke: "four-stroke" } as const;
const USAGE_SHORT: Record<UsageUnit, string> = { hours: "h", kilometres: "km", laps: "laps", litres: "L" };

export function formatSheetUsage(value: number, unit: UsageUnit): string {
  return `${Math.round(value * 100) / 100} ${USAGE_SHORT[unit]}`;
}

function describeSpec(e: Engine, cls: RacingClass | null, units: UnitChoice, unit: UsageUnit): SheetLine[] {
  const q = (kind: Parameters<typeof formatQuantity>[0], v: number | null): string => (v === null ? "—" : formatQuantity(kind, v, units));
  const elevations =
    e.builtForMinElevationM === null && e.builtForMaxElevationM === null
      ? "any"
      : `${e.builtForMinElevationM === null ? "up" : `from ${q("elevation", e.builtForMinElevationM)}`} ${e.builtForMaxElevationM === null ? "and above" : `to ${q("elevation", e.builtForMaxElevationM)}`}`;
  const limits = [
    e.topEndLimit !== null ? `top end every ${formatSheetUsage(e.topEndLimit, unit)}` : null,
    e.bottomEndLimit !== null ? `bottom end every ${formatSheetUsage(e.bottomEndLimit, unit)}` : null,
  ].filter(Boolean);
  return [
    { label: "Serial", value: e.serial ?? "—" },
    { label: "Configuration", value: `${e.cylinders}-cylinder ${CYCLE[e.cycle]}` },
    { label: "Bore × stroke", value: `${q("length", e.boreMm)} × ${q("length", e.strokeMm)}` },
    { label: "Displacement", value: `${q("volume", e.displacementCc)} (${q("volume", e.sweptCc)} per cylinder)` },
    { label: "Rod length", value: q("length", e.rodMm) },
    { label: "Exhaust opens", value: e.exhaustOpensDegAtdc === null ? "—" : `${e.exhaustOpensDegAtdc}° ATDC` },
    { label: "Target geometric ratio", value: q("ratio", e.targetRatio) },
    { label: "Target squish", value: q("squish", e.targetSquishMm) },
    { label: "Built for fuel", value: [e.buildFuelNote, e.buildMinOctane !== null ? `minimum octane ${e.buildMinOctane}` : null].filter(Boolean).join(", ") || "—" },
    { label: "Built for elevations", value: elevations },
    { label: "Racing class", value: cls?.name ?? "none" },
    { label: "Service limits", value: limits.join(", ") || "none set" },
  ];
}

/** Days between two sessions that still belong to one event (a weekend, a hillclimb's two days). */
const EVENT_GAP_DAYS = 6;

function daysBetween(a: string, b: string): number {
  return Math.round((Date.parse(`${b}T00:00:00Z`) - Date.parse(`${a}T00:00:00Z`)) / 86_400_000);
}

/**
 * Usage summed per event, newest first: sessions with the same label within a few days of each
 * other are one event, so "Home test" of two seasons stays two lines.
 */
function sumUsageByEvent(items: TimelineItem[]): UsageByEvent[] {
  const usage = items.filter((i) => i.kind === "usage").sort((a, b) => (a.on < b.on ? -1 : a.on > b.on ? 1 : 0));
  const events: UsageByEvent[] = [];
  const open = new Map<string, UsageByEvent>();
  for (const i of usage) {
    const label = (i.details.eventLabel as string | null) ?? "unlabelled sessions";
    const amount = Number(i.details.amount ?? 0);
    let e = open.get(label);
    if (!e || daysBetween(e.to, i.on) > EVENT_GAP_DAYS) {
      e = { label, from: i.on, to: i.on, amount: 0 };
      events.push(e);
      open.set(label, e);
    }
    e.amount = Math.round((e.amount + amount) * 100) / 100;
    e.to = i.on;
  }
  return events.reverse().slice(0, EVENTS_MAX);
}

export async function loadBuildSheet(organisationId: number, organisationName: string, engineId: number, units: UnitChoice, now: Date): Promise<BuildSheet> {
  const file = await getEngineFile(organisationId, engineId);
  const settings = await loadOrgSettings(organisationId);
  const timeline = await getEngineTimeline(organisationId, engineId, { page: 1, limit: 500 });
  const history = timeline.items.filter((i) => i.kind !== "usage");
  return {
    organisationName,
    printedOn: dayIn(now, settings.timeZone),
    unit: settings.usageUnit,
    engine: file.engine,
    racingClass: file.racingClass,
    installation: file.installation,
    counters: file.counters,
    spec: describeSpec(file.engine, file.racingClass, units, settings.usageUnit),
    latest: file.latestReadingSet,
    baseline: file.baselineReadingSet,
    history: history.slice(0, HISTORY_MAX),
    historyTotal: history.length,
    usageByEvent: sumUsageByEvent(timeline.items),
    parts: file.parts,
    cautions: [...COMPRESSION_CAUTIONS, CAUTION_FUEL_FIRE_CODES],
    signatures: ["Engine builder", "Crew chief", "Technical inspector"],
  };
}
