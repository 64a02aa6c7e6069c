import { DomainInputError } from "../errors";
import { requireFinite, requireNonNegative } from "../input-guards";
import { parseDayNumber } from "./day-math";
import { attachParts, normalizeEngine, type NormEngine } from "./normalize-engines";
import { requireId, requireKind, toCentiHours } from "./planner-guards";
import type { JobKind, PlannerInput } from "./types";

export type { Counter, NormEngine } from "./normalize-engines";

// Checks every field once and turns the input into day numbers, centi-hours of labour and flat
// counters, so the planning loop never re-validates or parses a date.

export interface NormEntry {
  entryId: string;
  chassisId: string;
  usage: number;
  family: string | null;
}

export interface NormEvent {
  id: string;
  name: string;
  startDay: number;
  endDay: number;
  elevationM: number;
  important: boolean;
  entries: NormEntry[];
  /** Events that started before today are history: they block the shop but are not planned. */
  inScope: boolean;
}

export interface NormJobPin {
  engineIndex: number;
  kind: JobKind;
  day: number;
}

export interface NormInput {
  todayDay: number;
  horizonEndDay: number;
  usageUnit: string;
  engines: NormEngine[];
  engineIndexById: Map<string, number>;
  /** Sorted by start day, end day, then id. */
  events: NormEvent[];
  entryPins: Map<string, number>;
  jobPins: NormJobPin[];
  shopCentiByWeekday: number[];
  closedDays: Set<number>;
  travelDays: number;
  partsLeadDays: number;
}

const MAX_SEASON_DAYS = 3700;
/** Days kept after the last event so a pinned job can still be fitted after it. */
const HORIZON_TAIL_DAYS = 120;

function normalizeEvents(input: PlannerInput, todayDay: number): NormEvent[] {
  if (!Array.isArray(input.events)) throw new DomainInputError("events", "events must be a list");
  const eventIds = new Set<string>();
  const entryIds = new Set<string>();
  const events = input.events.map((event, i): NormEvent => {
    const f = `events[${i}]`;
    const id = requireId(`${f}.id`, event.id);
    if (eventIds.has(id)) throw new DomainInputError(`${f}.id`, `event id ${id} appears twice`);
    eventIds.add(id);
    const startDay = parseDayNumber(`${f}.startDate`, event.startDate);
    const endDay = parseDayNumber(`${f}.endDate`, event.endDate);
    if (endDay < startDay) {
      throw new DomainInputError(`${f}.endDate`, `event ${id} ends before it starts`);
    }
    const chassisSeen = new Set<string>();
    const entries = (event.entries ?? []).map((entry, j): NormEntry => {
      const ef = `${f}.entries[${j}]`;
      const entryId = requireId(`${ef}.entryId`, entry.entryId);
      if (entryIds.has(entryId)) {
        throw new DomainInputError(`${ef}.entryId`, `entry id ${entryId} appears twice`);
      }
      entryIds.add(entryId);
      const chassisId = requireId(`${ef}.chassisId`, entry.chassisId);
      if (chassisSeen.has(chassisId)) {
        throw new DomainInputError(`${ef}.chassisId`, `chassis ${chassisId} is entered twice in event ${id}`);
      }
      chassisSeen.add(chassisId);
      return {
        entryId,
        chassisId,
        usage: requireNonNegative(`${ef}.expectedUsage`, entry.expectedUsage),
        family: entry.engineFamily === undefined ? null : requireId(`${ef}.engineFamily`, entry.engineFamily),
      };
    });
    return {
      id,
      name: typeof event.name === "string" && event.name !== "" ? event.name : id,
      startDay,
      endDay,
      elevationM: requireFinite(`${f}.elevationM`, event.elevationM),
      important: event.important === true,
      entries,
      inScope: startDay >= todayDay,
    };
  });
  return events.sort((a, b) => a.startDay - b.startDay || a.endDay - b.endDay || (a.id < b.id ? -1 : 1));
}

function requireWholeDays(field: string, value: unknown): number {
  const n = requireNonNegative(field, value);
  if (!Number.isInteger(n)) throw new DomainInputError(field, `${field} must be a whole number of days`);
  return n;
}

export function normalizePlannerInput(input: PlannerInput): NormInput {
  const todayDay = parseDayNumber("today", input.today);
  if (!Array.isArray(input.engines)) throw new DomainInputError("engines", "engines must be a list");
  if (!input.shop || typeof input.shop !== "object") throw new DomainInputError("shop", "shop is required");
  const engines = input.engines.map((e, i) => normalizeEngine(input, e, i));
  const engineIndexById = new Map<string, number>();
  const seatedChassis = new Set<string>();
  for (const e of engines) {
    if (engineIndexById.has(e.id)) throw new DomainInputError(`engines[${e.index}].id`, `engine id ${e.id} appears twice`);
    engineIndexById.set(e.id, e.index);
    if (e.chassisId !== null && !e.retired) {
      if (seatedChassis.has(e.chassisId)) {
        throw new DomainInputError(`engines[${e.index}].chassisId`, `two engines are in chassis ${e.chassisId}`);
      }
      seatedChassis.add(e.chassisId);
    }
  }
  attachParts(input, engines, engineIndexById);
  const events = normalizeEvents(input, todayDay);
  const allEntryIds = new Set(events.flatMap((e) => e.entries.map((x) => x.entryId)));

  const shop = input.shop;
  if (!shop || !Array.isArray(shop.hoursPerWeekday) || shop.hoursPerWeekday.length !== 7) {
    throw new DomainInputError("shop.hoursPerWeekday", "shop.hoursPerWeekday must list 7 days, Monday first");
  }
  const shopCentiByWeekday = shop.hoursPerWeekday.map((h, i) =>
    toCentiHours(requireNonNegative(`shop.hoursPerWeekday[${i}]`, h)),
  );
  const closedDays = new Set((shop.closedDates ?? []).map((d, i) => parseDayNumber(`shop.closedDates[${i}]`, d)));

  const entryPins = new Map<string, number>();
  (input.entryPins ?? []).forEach((pin, i) => {
    const f = `entryPins[${i}]`;
    if (!allEntryIds.has(pin.entryId)) throw new DomainInputError(`${f}.entryId`, `pin names an unknown entry ${pin.entryId}`);
    const engineIndex = engineIndexById.get(pin.engineId);
    if (engineIndex === undefined) throw new DomainInputError(`${f}.engineId`, `pin names an unknown engine ${pin.engineId}`);
    if (entryPins.has(pin.entryId)) throw new DomainInputError(`${f}.entryId`, `entry ${pin.entryId} is pinned twice`);
    entryPins.set(pin.entryId, engineIndex);
  });
  const jobPins = (input.jobPins ?? []).map((pin, i): NormJobPin => {
    const f = `jobPins[${i}]`;
    const engineIndex = engineIndexById.get(pin.jobEngineId);
    if (engineIndex === undefined) throw new DomainInputError(`${f}.jobEngineId`, `pin names an unknown engine ${pin.jobEngineId}`);
    return { engineIndex, kind: requireKind(`${f}.kind`, pin.kind), day: parseDayNumber(`${f}.date`, pin.date) };
  });

  const lastDay = Math.max(todayDay, ...events.map((e) => e.endDay), ...jobPins.map((p) => p.day));
  const horizonEndDay = lastDay + HORIZON_TAIL_DAYS;
  if (horizonEndDay - todayDay > MAX_SEASON_DAYS) {
    throw new DomainInputError("events", "the season runs more than ten years past today");
  }
  return {
    todayDay,
    horizonEndDay,
    usageUnit: typeof input.usageUnit === "string" && input.usageUnit !== "" ? input.usageUnit : "h",
    engines,
    engineIndexById,
    events,
    entryPins,
    jobPins,
    shopCentiByWeekday,
    closedDays,
    travelDays: shop.travelDaysBeforeEvent === undefined ? 1 : requireWholeDays("shop.travelDaysBeforeEvent", shop.travelDaysBeforeEvent),
    partsLeadDays: requireWholeDays("shop.partsLeadDays", shop.partsLeadDays),
  };
}
