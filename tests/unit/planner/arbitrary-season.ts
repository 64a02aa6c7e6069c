import fc from "fast-check";
import type { JobKind, PlannerEngine, PlannerEvent, PlannerInput, PlannerPart } from "../../../src/lib/domain/planner/types";

// A fast-check arbitrary for small, awkward seasons: engines already past a limit, retired or
// away, engines of two families and entries open to any, overlapping events sharing a chassis,
// events already under way, parts, inspections, closed days, starved shops and random pins.

const TODAY_MS = Date.UTC(2026, 2, 2); // Monday 2 March 2026

function dayAt(offset: number): string {
  return new Date(TODAY_MS + offset * 86_400_000).toISOString().slice(0, 10);
}

const FAMILIES = ["a", "b", undefined] as const;
const KINDS: JobKind[] = ["topEnd", "bottomEnd", "inspection"];

const engineArb = fc.record({
  family: fc.constantFrom(...FAMILIES),
  topEndLimit: fc.integer({ min: 2, max: 12 }),
  topUsedTenths: fc.integer({ min: 0, max: 130 }),
  bottomEndLimit: fc.option(fc.integer({ min: 6, max: 30 }), { nil: undefined }),
  bottomUsedTenths: fc.integer({ min: 0, max: 300 }),
  inspectionInterval: fc.option(fc.integer({ min: 2, max: 8 }), { nil: undefined }),
  inspectionUsedTenths: fc.integer({ min: 0, max: 80 }),
  status: fc.constantFrom("running", "spare", "bench", "retired" as const),
  minElevationM: fc.option(fc.constant(1800), { nil: undefined }),
  availableOffset: fc.option(fc.integer({ min: -3, max: 20 }), { nil: undefined }),
  seat: fc.integer({ min: 0, max: 6 }),
});

const eventArb = fc.record({
  startOffset: fc.integer({ min: -4, max: 35 }),
  days: fc.integer({ min: 1, max: 3 }),
  elevationM: fc.integer({ min: 200, max: 3000 }),
  important: fc.boolean(),
  chassis: fc.uniqueArray(fc.integer({ min: 0, max: 5 }), { minLength: 1, maxLength: 3 }),
  usage: fc.constantFrom(0, 0.6, 0.8, 1, 1.5, 2, 5),
  family: fc.constantFrom(...FAMILIES),
});

export const seasonArb: fc.Arbitrary<PlannerInput> = fc
  .record({
    engines: fc.array(engineArb, { minLength: 1, maxLength: 9 }),
    events: fc.array(eventArb, { minLength: 1, maxLength: 6 }),
    hours: fc.array(fc.constantFrom(0, 1, 2.5, 4, 8), { minLength: 7, maxLength: 7 }),
    closed: fc.uniqueArray(fc.integer({ min: 0, max: 40 }), { maxLength: 5 }),
    travel: fc.integer({ min: 0, max: 2 }),
    labour: fc.record({ topEnd: fc.constantFrom(1, 2.5, 4, 6), bottomEnd: fc.constantFrom(4, 8, 12), inspection: fc.constantFrom(0.5, 1.5) }),
    partsLeadDays: fc.integer({ min: 0, max: 5 }),
    parts: fc.array(fc.record({ engine: fc.nat(), usedTenths: fc.integer({ min: 0, max: 60 }), limit: fc.integer({ min: 2, max: 8 }), renewedBy: fc.constantFrom(...KINDS) }), { maxLength: 3 }),
    entryPins: fc.array(fc.record({ event: fc.nat(), entry: fc.nat(), engine: fc.nat() }), { maxLength: 2 }),
    jobPins: fc.array(fc.record({ engine: fc.nat(), kind: fc.constantFrom(...KINDS), offset: fc.integer({ min: -3, max: 30 }) }), { maxLength: 2 }),
  })
  .map((raw): PlannerInput => {
    const seated = new Set<number>();
    const engines = raw.engines.map((e, i): PlannerEngine => {
      const retired = e.status === "retired";
      const seat = !retired && e.seat < 6 && !seated.has(e.seat) ? e.seat : null;
      if (seat !== null) seated.add(seat);
      return {
        id: `E${i}`,
        name: `Engine ${i}`,
        ...(e.family ? { family: e.family } : {}),
        counters: { sinceTopEnd: e.topUsedTenths / 10, sinceBottomEnd: e.bottomUsedTenths / 10, sinceInspection: e.inspectionUsedTenths / 10 },
        policy: { topEndLimit: e.topEndLimit, bottomEndLimit: e.bottomEndLimit, inspectionInterval: e.inspectionInterval, planFraction: 0.8 },
        chassisId: seat === null ? null : `c${seat}`,
        status: e.status,
        ...(e.minElevationM ? { builtForMinElevationM: e.minElevationM } : {}),
        ...(e.availableOffset !== undefined ? { availableFrom: dayAt(e.availableOffset) } : {}),
      };
    });
    const events = raw.events.map((v, i): PlannerEvent => ({
      id: `V${i}`,
      name: `Event ${i}`,
      startDate: dayAt(v.startOffset),
      endDate: dayAt(v.startOffset + v.days - 1),
      elevationM: v.elevationM,
      important: v.important,
      entries: v.chassis.map((c) => ({
        entryId: `V${i}/c${c}`,
        chassisId: `c${c}`,
        expectedUsage: v.usage,
        ...(v.family ? { engineFamily: v.family } : {}),
      })),
    }));
    const parts = raw.parts.map((p, i): PlannerPart => ({
      id: `P${i}`,
      name: `part ${i}`,
      engineId: engines[p.engine % engines.length].id,
      usage: p.usedTenths / 10,
      limit: p.limit,
      renewedBy: p.renewedBy,
    }));
    const entryPins = new Map<string, string>();
    for (const pin of raw.entryPins) {
      const event = events[pin.event % events.length];
      entryPins.set(event.entries[pin.entry % event.entries.length].entryId, engines[pin.engine % engines.length].id);
    }
    return {
      today: dayAt(0),
      engines,
      parts,
      events,
      shop: {
        hoursPerWeekday: raw.hours,
        closedDates: raw.closed.map(dayAt),
        travelDaysBeforeEvent: raw.travel,
        labourHours: raw.labour,
        partsLeadDays: raw.partsLeadDays,
      },
      entryPins: [...entryPins].map(([entryId, engineId]) => ({ entryId, engineId })),
      jobPins: raw.jobPins.map((p) => ({ jobEngineId: engines[p.engine % engines.length].id, kind: p.kind, date: dayAt(p.offset) })),
    };
  });
