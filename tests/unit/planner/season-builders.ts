import type { PlannerEngine, PlannerEvent, PlannerInput, ShopCalendar } from "../../../src/lib/domain/planner/types";

// Small builders for hand-made test seasons: defaults that keep each test about the one thing
// it checks. All figures are invented test data.

export interface EngineSpec {
  top?: number;
  bottom?: number;
  inspection?: number;
  topEndLimit?: number;
  bottomEndLimit?: number;
  inspectionInterval?: number;
  chassisId?: string | null;
  status?: PlannerEngine["status"];
  family?: string;
  minElevationM?: number;
  availableFrom?: string;
}

export function makeEngine(id: string, spec: EngineSpec = {}): PlannerEngine {
  return {
    id,
    name: id,
    ...(spec.family !== undefined ? { family: spec.family } : {}),
    counters: { sinceTopEnd: spec.top ?? 0, sinceBottomEnd: spec.bottom ?? 0, sinceInspection: spec.inspection ?? 0 },
    policy: {
      topEndLimit: spec.topEndLimit ?? 8,
      ...(spec.bottomEndLimit !== undefined ? { bottomEndLimit: spec.bottomEndLimit } : {}),
      ...(spec.inspectionInterval !== undefined ? { inspectionInterval: spec.inspectionInterval } : {}),
      planFraction: 0.8,
    },
    chassisId: spec.chassisId ?? null,
    status: spec.status ?? (spec.chassisId ? "running" : "spare"),
    ...(spec.minElevationM !== undefined ? { builtForMinElevationM: spec.minElevationM } : {}),
    ...(spec.availableFrom !== undefined ? { availableFrom: spec.availableFrom } : {}),
  };
}

export interface EventSpec {
  name?: string;
  important?: boolean;
  elevationM?: number;
  family?: string;
}

/** Entries are [chassisId, usage]; each entry id is `${eventId}/${chassisId}`. */
export function makeEvent(id: string, startDate: string, endDate: string, entries: Array<[string, number]>, spec: EventSpec = {}): PlannerEvent {
  return {
    id,
    name: spec.name ?? id,
    startDate,
    endDate,
    elevationM: spec.elevationM ?? 400,
    important: spec.important ?? false,
    entries: entries.map(([chassisId, usage]) => ({
      entryId: `${id}/${chassisId}`,
      chassisId,
      expectedUsage: usage,
      ...(spec.family !== undefined ? { engineFamily: spec.family } : {}),
    })),
  };
}

export function makeShop(spec: Partial<ShopCalendar> = {}): ShopCalendar {
  return {
    hoursPerWeekday: [8, 8, 8, 8, 8, 0, 0],
    closedDates: [],
    labourHours: { topEnd: 4, bottomEnd: 12, inspection: 1.5 },
    partsLeadDays: 0,
    ...spec,
  };
}

/** Saturdays from 7 Feb 2026 on, one a week: a quiet run of one-day events. */
export function listSaturdays(count: number): string[] {
  const out: string[] = [];
  for (let i = 0; i < count; i++) {
    const day = 7 + 7 * i;
    const month = day <= 28 ? 2 : day <= 59 ? 3 : 4;
    const dom = month === 2 ? day : month === 3 ? day - 28 : day - 59;
    out.push(`2026-${String(month).padStart(2, "0")}-${String(dom).padStart(2, "0")}`);
  }
  return out;
}

export function makeInput(partial: Partial<PlannerInput> & Pick<PlannerInput, "engines" | "events">): PlannerInput {
  return { today: "2026-02-02", shop: makeShop(), ...partial };
}
