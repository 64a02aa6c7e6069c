import { DomainInputError } from "../errors";
import type { CylinderReading, EngineSignalInput, ReadingSet, UsageCounter } from "./types";

// Checks the whole input before any rule runs, so a bad field fails loudly with its path
// (readings[2].cylinders[0].squishMm[1]) instead of surfacing as a NaN in a mail.

const MIN_ELEVATION_M = -500;
const MAX_ELEVATION_M = 9000;
const MAX_CYLINDERS = 16;

function fail(field: string, message: string): never {
  throw new DomainInputError(field, `${field} ${message}`);
}

function requireNumber(field: string, value: unknown): number {
  if (typeof value !== "number" || !Number.isFinite(value)) fail(field, "must be a finite number");
  return value;
}

function requirePositive(field: string, value: unknown): number {
  const n = requireNumber(field, value);
  if (n <= 0) fail(field, "must be greater than zero");
  return n;
}

function requireNonNegative(field: string, value: unknown): number {
  const n = requireNumber(field, value);
  if (n < 0) fail(field, "must not be negative");
  return n;
}

function requireText(field: string, value: unknown): string {
  if (typeof value !== "string" || value.trim() === "") fail(field, "must be a non-empty string");
  return value;
}

function isPresent<T>(value: T | null | undefined): value is T {
  return value !== null && value !== undefined;
}

function checkCylinder(field: string, c: CylinderReading, cylinderCount: number): void {
  if (!c || typeof c !== "object") fail(field, "must be an object");
  const n = requireNumber(`${field}.cylinder`, c.cylinder);
  if (!Number.isInteger(n) || n < 1 || n > cylinderCount) {
    fail(`${field}.cylinder`, `must be a whole number from 1 to ${cylinderCount}`);
  }
  if (isPresent(c.chamberCc)) requirePositive(`${field}.chamberCc`, c.chamberCc);
  if (c.chamberUnconfirmed !== undefined && typeof c.chamberUnconfirmed !== "boolean") {
    fail(`${field}.chamberUnconfirmed`, "must be true or false");
  }
  if (c.chamberReadingsCc !== undefined) {
    if (!Array.isArray(c.chamberReadingsCc)) fail(`${field}.chamberReadingsCc`, "must be a list");
    c.chamberReadingsCc.forEach((v, i) => requirePositive(`${field}.chamberReadingsCc[${i}]`, v));
  }
  if (isPresent(c.squishMm)) {
    if (!Array.isArray(c.squishMm) || c.squishMm.length !== 2) fail(`${field}.squishMm`, "must be [sideA, sideB]");
    requirePositive(`${field}.squishMm[0]`, c.squishMm[0]);
    requirePositive(`${field}.squishMm[1]`, c.squishMm[1]);
  }
  if (isPresent(c.crankingKpa)) requireNonNegative(`${field}.crankingKpa`, c.crankingKpa);
  if (isPresent(c.leakdownPct)) {
    const pct = requireNonNegative(`${field}.leakdownPct`, c.leakdownPct);
    if (pct > 100) fail(`${field}.leakdownPct`, "must not exceed 100");
  }
}

function checkReadingSet(field: string, set: ReadingSet, cylinderCount: number): void {
  if (!set || typeof set !== "object") fail(field, "must be a reading set");
  const elevation = requireNumber(`${field}.elevationM`, set.elevationM);
  if (elevation < MIN_ELEVATION_M || elevation > MAX_ELEVATION_M) {
    fail(`${field}.elevationM`, `must lie between ${MIN_ELEVATION_M} and ${MAX_ELEVATION_M}`);
  }
  if (set.engineHours !== undefined) requireNonNegative(`${field}.engineHours`, set.engineHours);
  if (!Array.isArray(set.cylinders)) fail(`${field}.cylinders`, "must be a list");
  const seen = new Set<number>();
  set.cylinders.forEach((c, i) => {
    checkCylinder(`${field}.cylinders[${i}]`, c, cylinderCount);
    if (seen.has(c.cylinder)) fail(`${field}.cylinders[${i}].cylinder`, `repeats cylinder ${c.cylinder}`);
    seen.add(c.cylinder);
  });
}

function checkCounter(field: string, u: UsageCounter): void {
  if (!u || typeof u !== "object") fail(field, "must be a usage counter");
  requireText(`${field}.id`, u.id);
  requireText(`${field}.label`, u.label);
  if (u.scope !== "engine" && u.scope !== "part") fail(`${field}.scope`, "must be engine or part");
  if (u.span !== "top-end" && u.span !== "bottom-end" && u.span !== "other") {
    fail(`${field}.span`, "must be top-end, bottom-end or other");
  }
  if (!["h", "L", "km", "laps"].includes(u.unit)) fail(`${field}.unit`, "must be h, L, km or laps");
  requireNonNegative(`${field}.used`, u.used);
  requirePositive(`${field}.limit`, u.limit);
}

export function validateEngineSignalInput(input: EngineSignalInput): void {
  if (!input || typeof input !== "object") fail("input", "must be an object");
  requireText("engineId", input.engineId);
  requireText("engineName", input.engineName);
  const count = requireNumber("cylinderCount", input.cylinderCount);
  if (!Number.isInteger(count) || count < 1 || count > MAX_CYLINDERS) {
    fail("cylinderCount", `must be a whole number from 1 to ${MAX_CYLINDERS}`);
  }
  if (input.planningFraction !== undefined) {
    const f = requirePositive("planningFraction", input.planningFraction);
    if (f > 1) fail("planningFraction", "must not exceed 1");
  }
  if (input.usage !== undefined) {
    if (!Array.isArray(input.usage)) fail("usage", "must be a list");
    const ids = new Set<string>();
    input.usage.forEach((u, i) => {
      checkCounter(`usage[${i}]`, u);
      if (ids.has(u.id)) fail(`usage[${i}].id`, `repeats ${u.id}`);
      ids.add(u.id);
    });
  }
  if (isPresent(input.nextEvent)) {
    requireText("nextEvent.name", input.nextEvent.name);
    if (input.nextEvent.expectedHours !== undefined) {
      requireNonNegative("nextEvent.expectedHours", input.nextEvent.expectedHours);
    }
    if (input.nextEvent.expectedLitres !== undefined) {
      requireNonNegative("nextEvent.expectedLitres", input.nextEvent.expectedLitres);
    }
  }
  if (isPresent(input.baseline)) {
    checkReadingSet("baseline", input.baseline, count);
    // Percent changes divide by the baseline: a zero there has no meaning to drift from.
    input.baseline.cylinders.forEach((c, i) => {
      if (isPresent(c.crankingKpa) && c.crankingKpa <= 0) {
        fail(`baseline.cylinders[${i}].crankingKpa`, "must be greater than zero in a baseline");
      }
    });
  }
  if (input.readings !== undefined) {
    if (!Array.isArray(input.readings)) fail("readings", "must be a list");
    input.readings.forEach((set, i) => checkReadingSet(`readings[${i}]`, set, count));
  }
  if (isPresent(input.classLimits)) {
    requireText("classLimits.className", input.classLimits.className);
    if (input.classLimits.minSquishMm !== undefined) {
      requirePositive("classLimits.minSquishMm", input.classLimits.minSquishMm);
    }
    if (input.classLimits.minChamberCc !== undefined) {
      requirePositive("classLimits.minChamberCc", input.classLimits.minChamberCc);
    }
  }
}
