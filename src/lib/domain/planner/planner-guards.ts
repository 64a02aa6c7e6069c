import { DomainInputError } from "../errors";
import { requirePositive } from "../input-guards";
import { JOB_KINDS, type JobKind } from "./types";

// Field checks the planner's input needs besides the shared numeric guards.

export function toCentiHours(hours: number): number {
  return Math.round(hours * 100);
}

export function requireId(field: string, value: unknown): string {
  if (typeof value !== "string" || value.trim() === "") {
    throw new DomainInputError(field, `${field} must be a non-empty text`);
  }
  return value;
}

export function requireKind(field: string, value: unknown): JobKind {
  if (!JOB_KINDS.includes(value as JobKind)) {
    throw new DomainInputError(field, `${field} must be one of ${JOB_KINDS.join(", ")}`);
  }
  return value as JobKind;
}

export function requireLabour(field: string, value: unknown): number {
  const centi = toCentiHours(requirePositive(field, value));
  if (centi < 1) throw new DomainInputError(field, `${field} must be at least 0.01 h`);
  return centi;
}
