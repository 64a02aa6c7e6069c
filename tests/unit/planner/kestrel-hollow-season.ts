import type { PlannerEngine, PlannerEvent, PlannerInput } from "../../../src/lib/domain/planner/types";

// Kestrel Hollow Racing's invented 2025–26 season from DEMO.md: engines A-1…A-7 with their
// policies, the thirteen events with their elevations and engine hours per entry. The counters
// at the start (17 Nov 2025) are invented demo data. Chassis: Kaja Lindqvist's cross sled #27
// and Beck Tamura's #114 take the 72 mm twins; the hillclimb sleds are #27H (85 mm twin) and
// Odd Sveen's #9 (the triple). A-4, the stock-head practice engine, is its own family.
// Shop: Rafe Gunnarson's 30 h a week (TRADE.md: 25–35 h in season, from memory), twin top end
// 4 h and bottom end 12 h (TRADE.md: twin top end 3–5 h, bottom end 10–14 h, from memory).

const twinPolicy = { topEndLimit: 8, bottomEndLimit: 24, planFraction: 0.8 };
const bigTwinPolicy = { topEndLimit: 10, bottomEndLimit: 25, planFraction: 0.8 };

function engine(id: string, family: string, top: number, bottom: number, policy: PlannerEngine["policy"], chassisId: string | null, extra: Partial<PlannerEngine> = {}): PlannerEngine {
  return {
    id,
    name: id,
    family,
    counters: { sinceTopEnd: top, sinceBottomEnd: bottom, sinceInspection: top },
    policy,
    chassisId,
    status: chassisId ? "running" : "spare",
    ...extra,
  };
}

export const KESTREL_ENGINES: PlannerEngine[] = [
  engine("A-1", "twin72", 3.5, 15, twinPolicy, "#27"),
  engine("A-2", "twin72", 2.0, 6, twinPolicy, "#114"),
  engine("A-3", "twin72", 0, 0, twinPolicy, null),
  engine("A-4", "twin72-stock", 9.0, 30, { topEndLimit: 10, planFraction: 0.8 }, null),
  engine("A-5", "twin85", 2.0, 19.0, bigTwinPolicy, "#27H", { builtForMinElevationM: 1800 }),
  engine("A-6", "twin85", 0, 0, bigTwinPolicy, null),
  engine("A-7", "triple", 2.0, 2.0, { topEndLimit: 8, planFraction: 0.8 }, "#9"),
];

type Row = [id: string, start: string, end: string, name: string, elevationM: number, kind: "cross" | "hill", usage: number];

const ROWS: Row[] = [
  ["k00", "2025-11-22", "2025-11-22", "home test", 366, "cross", 1.0],
  ["k01", "2025-12-05", "2025-12-07", "Pinecrest Flats", 351, "cross", 1.5],
  ["k02", "2025-12-19", "2025-12-21", "Harlow Lake", 451, "cross", 1.5],
  ["k03", "2026-01-02", "2026-01-04", "Red Tamarack", 625, "cross", 1.5],
  ["k04", "2026-01-16", "2026-01-18", "Birchmoor Fairgrounds", 396, "cross", 1.5],
  ["k05", "2026-01-30", "2026-02-01", "Stonegate Bowl", 975, "cross", 1.5],
  ["k06", "2026-02-07", "2026-02-08", "Copperjack Basin", 2103, "hill", 0],
  ["k07", "2026-02-13", "2026-02-15", "Harlow Lake II", 451, "cross", 1.5],
  ["k08", "2026-02-27", "2026-03-01", "Quillmore Ridge", 2377, "hill", 0],
  ["k09", "2026-03-06", "2026-03-08", "Birchmoor Final", 396, "cross", 1.5],
  ["k10", "2026-03-20", "2026-03-22", "Granite Notch", 2621, "hill", 0],
  ["k11", "2026-04-03", "2026-04-05", "Fenwick Summit", 2987, "hill", 0],
  ["k12", "2026-04-17", "2026-04-18", "Cold Fork Basin", 2499, "hill", 0],
];

export const KESTREL_EVENTS: PlannerEvent[] = ROWS.map(([id, startDate, endDate, name, elevationM, kind, usage]) => ({
  id,
  name,
  startDate,
  endDate,
  elevationM,
  important: id === "k09",
  entries:
    kind === "cross"
      ? [
          { entryId: `${id}/#27`, chassisId: "#27", expectedUsage: usage, engineFamily: "twin72" },
          { entryId: `${id}/#114`, chassisId: "#114", expectedUsage: usage, engineFamily: "twin72" },
        ]
      : [
          { entryId: `${id}/#27H`, chassisId: "#27H", expectedUsage: 0.8, engineFamily: "twin85" },
          { entryId: `${id}/#9`, chassisId: "#9", expectedUsage: 0.6, engineFamily: "triple" },
        ],
}));

export function buildKestrelSeason(): PlannerInput {
  return {
    today: "2025-11-17",
    engines: structuredClone(KESTREL_ENGINES),
    events: structuredClone(KESTREL_EVENTS),
    shop: {
      hoursPerWeekday: [6, 6, 6, 6, 6, 0, 0],
      closedDates: ["2025-12-24", "2025-12-25", "2025-12-26", "2025-12-31", "2026-01-01"],
      labourHours: { topEnd: 4, bottomEnd: 12, inspection: 1.5 },
      labourHoursByFamily: { triple: { topEnd: 5, bottomEnd: 14 } },
      partsLeadDays: 3,
    },
  };
}
