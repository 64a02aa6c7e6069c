import { DomainInputError } from "../errors";
import { requirePositiveInteger } from "../input-guards";
import { formatDayNumber, parseDayNumber } from "./day-math";
import type { EntryPin, JobPin, PlannerEngine, PlannerEvent, PlannerInput, PlannerPart } from "./types";

// Invented fleets and seasons for tests and the bench: same seed, same fleet. Everything here is
// demo data; the family figures sit inside the ranges TRADE.md gives (two-stroke top ends
// 8–15 h, twin top end 3–5 h of labour, bottom end 10–14 h).

export interface FleetOptions {
  engines: number;
  events: number;
  seed: number;
  /** Scales the shop hours; below 1 starves the shop so conflicts appear. Default 1. */
  shopScale?: number;
  /** Share of weekends with a second, overlapping event. Default 0.15. */
  overlapShare?: number;
  entryPins?: number;
  jobPins?: number;
  withParts?: boolean;
  /** A Monday; the season's first events are on the weekend after it. */
  today?: string;
}

/** mulberry32: a small, well-mixed 32-bit generator; plenty for invented seasons. */
export function createSeededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

interface Family {
  name: string;
  share: number;
  topEndLimit: number;
  bottomEndLimit: number;
  labour: { topEnd: number; bottomEnd: number; inspection: number };
}

const FAMILIES: Family[] = [
  { name: "twin", share: 0.45, topEndLimit: 8, bottomEndLimit: 24, labour: { topEnd: 4, bottomEnd: 12, inspection: 1.5 } },
  { name: "single", share: 0.35, topEndLimit: 15, bottomEndLimit: 45, labour: { topEnd: 2.5, bottomEnd: 8, inspection: 1 } },
  { name: "triple", share: 0.2, topEndLimit: 10, bottomEndLimit: 30, labour: { topEnd: 5, bottomEnd: 14, inspection: 2 } },
];

interface EventKind {
  name: string;
  share: number;
  days: number;
  /** Offset of the first day from the weekend's Friday. */
  offset: number;
  usage: number[];
  elevationM: [number, number];
}

const EVENT_KINDS: EventKind[] = [
  { name: "Cross", share: 0.45, days: 3, offset: 0, usage: [1.5], elevationM: [200, 1000] },
  { name: "Hillclimb", share: 0.3, days: 2, offset: 1, usage: [0.6, 0.8], elevationM: [1800, 3000] },
  { name: "Practice", share: 0.1, days: 1, offset: 1, usage: [1.0], elevationM: [300, 600] },
  { name: "Enduro", share: 0.15, days: 2, offset: 1, usage: [2.0], elevationM: [500, 2000] },
];

function pickShare<T extends { share: number }>(random: () => number, items: T[]): T {
  let r = random();
  for (const item of items) {
    if (r < item.share) return item;
    r -= item.share;
  }
  return items[items.length - 1];
}

function roundTenth(x: number): number {
  return Math.round(x * 10) / 10;
}

function shuffle<T>(random: () => number, items: T[]): T[] {
  const out = [...items];
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

function pad(n: number, width: number): string {
  return String(n).padStart(width, "0");
}

interface Chassis {
  id: string;
  family: string;
}

/** Engines get a family at random; each family gets chassis for about 80 % of its engines. */
function makeEngines(random: () => number, count: number, todayDay: number): { engines: PlannerEngine[]; chassis: Chassis[] } {
  const families = Array.from({ length: count }, () => pickShare(random, FAMILIES));
  const chassis: Chassis[] = [];
  const seatOf = new Map<number, string>();
  for (const family of FAMILIES) {
    const members = families.flatMap((f, i) => (f === family ? [i] : []));
    const seats = members.length === 0 ? 0 : Math.max(1, Math.round(members.length * 0.8));
    const shuffled = shuffle(random, members);
    for (let s = 0; s < seats; s++) {
      const id = `#${pad(chassis.length + 1, 3)}`;
      chassis.push({ id, family: family.name });
      seatOf.set(shuffled[s], id);
    }
  }
  const engines = families.map((family, i): PlannerEngine => {
    const seated = seatOf.get(i) ?? null;
    const retired = seated === null && random() < 0.03;
    const late = !retired && random() < 0.04;
    const topUsed = roundTenth(random() * family.topEndLimit * 0.9);
    return {
      id: `E-${pad(i + 1, 4)}`,
      name: `Engine ${i + 1} (${family.name})`,
      family: family.name,
      counters: {
        sinceTopEnd: topUsed,
        sinceBottomEnd: Math.max(topUsed, roundTenth(random() * family.bottomEndLimit * 0.9)),
        sinceInspection: topUsed,
      },
      policy: { topEndLimit: family.topEndLimit, bottomEndLimit: family.bottomEndLimit, planFraction: 0.8 },
      chassisId: retired ? null : seated,
      status: retired ? "retired" : late ? "bench" : seated ? "running" : "spare",
      ...(random() < 0.1 ? { builtForMinElevationM: 1800 } : {}),
      ...(late ? { availableFrom: formatDayNumber(todayDay + 7 + Math.floor(random() * 35)) } : {}),
    };
  });
  return { engines, chassis };
}

function makeEvents(random: () => number, count: number, chassis: Chassis[], todayDay: number, overlapShare: number): PlannerEvent[] {
  const events: PlannerEvent[] = [];
  let friday = todayDay + 4;
  while (events.length < count) {
    const pair = events.length + 1 < count && chassis.length >= 2 && random() < overlapShare;
    const pools = pair ? (() => { const s = shuffle(random, chassis); const h = Math.ceil(s.length / 2); return [s.slice(0, h), s.slice(h)]; })() : [chassis];
    for (const pool of pools) {
      const kind = pickShare(random, EVENT_KINDS);
      const n = events.length + 1;
      const entered = shuffle(random, pool).slice(0, Math.max(1, Math.round(pool.length * (0.5 + random() * 0.5))));
      const [low, high] = kind.elevationM;
      events.push({
        id: `V-${pad(n, 3)}`,
        name: `${kind.name} ${n}`,
        startDate: formatDayNumber(friday + kind.offset),
        endDate: formatDayNumber(friday + kind.offset + kind.days - 1),
        elevationM: Math.round(low + random() * (high - low)),
        important: random() < 0.15,
        entries: entered
          .sort((a, b) => (a.id < b.id ? -1 : 1))
          .map((c) => ({
            entryId: `V-${pad(n, 3)}/${c.id}`,
            chassisId: c.id,
            engineFamily: c.family,
            expectedUsage: kind.usage[Math.floor(random() * kind.usage.length)],
          })),
      });
    }
    friday += 7;
  }
  return events;
}

export function generateFleet(options: FleetOptions): PlannerInput {
  const engineCount = requirePositiveInteger("engines", options.engines, 100_000);
  const eventCount = requirePositiveInteger("events", options.events, 2_000);
  if (!Number.isInteger(options.seed)) throw new DomainInputError("seed", "seed must be a whole number");
  const random = createSeededRandom(options.seed);
  const today = options.today ?? "2026-01-05";
  const todayDay = parseDayNumber("today", today);
  const { engines, chassis } = makeEngines(random, engineCount, todayDay);
  const events = makeEvents(random, eventCount, chassis, todayDay, options.overlapShare ?? 0.15);

  // Enough hands for the rebuilds the season implies: each family's labour per hour run (two
  // top ends and a bottom end per bottom-end life), over the weekdays no event or travel day
  // blocks, with as much again in reserve for the weeks when many engines fall due together.
  const lastDay = events.length > 0 ? parseDayNumber("end", events[events.length - 1].endDate) : todayDay + 7;
  const weeks = Math.max(1, Math.ceil((lastDay - todayDay) / 7));
  const blocked = new Set<number>();
  for (const e of events) {
    for (let d = parseDayNumber("start", e.startDate) - 1; d <= parseDayNumber("end", e.endDate); d++) blocked.add(d);
  }
  let openDays = 0;
  for (let d = todayDay; d < lastDay; d++) if ((d + 3) % 7 < 5 && !blocked.has(d)) openDays += 1;
  const labourPerHour = new Map(FAMILIES.map((f) => [f.name, (2 * f.labour.topEnd + f.labour.bottomEnd) / (3 * f.topEndLimit)]));
  const labour = events.reduce((s, e) => s + e.entries.reduce((t, x) => t + x.expectedUsage * (labourPerHour.get(x.engineFamily ?? "") ?? 1), 0), 0);
  const perDay = Math.max(6, (labour * 2) / Math.max(1, openDays)) * (options.shopScale ?? 1);
  const hours = Math.max(0.25, Math.round(perDay * 4) / 4);

  const closedDates = Array.from({ length: Math.floor(weeks / 8) }, () => formatDayNumber(todayDay + 7 * Math.floor(random() * weeks) + 1));
  const parts: PlannerPart[] = options.withParts
    ? engines.filter(() => random() < 0.3).map((e, i) => ({
        id: `P-${pad(i + 1, 4)}`,
        name: `race piston ${i + 1}`,
        engineId: e.id,
        usage: e.counters.sinceTopEnd,
        limit: roundTenth(e.policy.topEndLimit * 0.9),
        renewedBy: "topEnd" as const,
      }))
    : [];
  const entryPins: EntryPin[] = [];
  for (let i = 0; i < (options.entryPins ?? 0) && events.length > 0; i++) {
    const event = events[Math.floor(random() * events.length)];
    const entry = event.entries[Math.floor(random() * event.entries.length)];
    if (!entry || entryPins.some((p) => p.entryId === entry.entryId)) continue;
    entryPins.push({ entryId: entry.entryId, engineId: engines[Math.floor(random() * engines.length)].id });
  }
  const jobPins: JobPin[] = Array.from({ length: options.jobPins ?? 0 }, () => ({
    jobEngineId: engines[Math.floor(random() * engines.length)].id,
    kind: random() < 0.8 ? "topEnd" : "inspection",
    date: formatDayNumber(todayDay + 7 * Math.floor(random() * weeks) + Math.floor(random() * 4)),
  }));
  return {
    today,
    engines,
    parts,
    events,
    shop: {
      hoursPerWeekday: [hours, hours, hours, hours, hours, 0, 0],
      closedDates: [...new Set(closedDates)].sort(),
      travelDaysBeforeEvent: 1,
      labourHours: { topEnd: 4, bottomEnd: 12, inspection: 1.5 },
      labourHoursByFamily: Object.fromEntries(FAMILIES.map((f) => [f.name, f.labour])),
      partsLeadDays: 2,
    },
    entryPins,
    jobPins,
  };
}
