import { DomainInputError } from "./errors";

// Shared checks for the compression modules: each throws a DomainInputError naming the field,
// so the API can answer 400 with the field and nothing downstream ever sees NaN.

export function requireFinite(field: string, value: unknown): number {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new DomainInputError(field, `${field} must be a finite number`);
  }
  return value;
}

export function requirePositive(field: string, value: unknown): number {
  const n = requireFinite(field, value);
  if (n <= 0) throw new DomainInputError(field, `${field} must be greater than zero`);
  return n;
}

export function requireNonNegative(field: string, value: unknown): number {
  const n = requireFinite(field, value);
  if (n < 0) throw new DomainInputError(field, `${field} must not be negative`);
  return n;
}

export function requireInRange(field: string, value: unknown, min: number, max: number): number {
  const n = requireFinite(field, value);
  if (n < min || n > max) {
    throw new DomainInputError(field, `${field} must lie between ${min} and ${max}`);
  }
  return n;
}

/** A crank angle given as input: 0–180° after TDC, inclusive. */
export function requireHalfTurnDeg(field: string, value: unknown): number {
  return requireInRange(field, value, 0, 180);
}

export function requirePositiveInteger(field: string, value: unknown, max: number): number {
  const n = requireFinite(field, value);
  if (!Number.isInteger(n) || n < 1 || n > max) {
    throw new DomainInputError(field, `${field} must be a whole number from 1 to ${max}`);
  }
  return n;
}

/** A rod no longer than the crank radius cannot reach past the crank centre. */
export function requireRodFitsStroke(rodMm: unknown, strokeMm: number): number {
  const rod = requirePositive("rodMm", rodMm);
  if (rod <= strokeMm / 2) {
    throw new DomainInputError("rodMm", "rodMm must be longer than half the stroke");
  }
  return rod;
}
