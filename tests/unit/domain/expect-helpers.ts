import { expect } from "vitest";
import { DomainInputError } from "../../../src/lib/domain/errors";

/** |actual − expected| ≤ rel·|expected| (REFERENCES.md: exact factors 1e-12, formulas 1e-6). */
export function expectRelative(actual: number, expected: number, rel: number): void {
  expect(Number.isFinite(actual)).toBe(true);
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(rel * Math.abs(expected));
}

/** |actual − printed| ≤ half a unit of the last printed digit. */
export function expectPrinted(actual: number, printed: number, decimals: number): void {
  expect(Number.isFinite(actual)).toBe(true);
  expect(Math.abs(actual - printed)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-12);
}

export function expectFieldError(run: () => unknown, field: string): void {
  let caught: unknown;
  try {
    run();
  } catch (error) {
    caught = error;
  }
  expect(caught).toBeInstanceOf(DomainInputError);
  expect((caught as DomainInputError).field).toBe(field);
}

/** Every number anywhere in a value is finite (what the API promises: no NaN, no Infinity). */
export function expectAllFinite(value: unknown): void {
  if (typeof value === "number") {
    expect(Number.isFinite(value)).toBe(true);
  } else if (Array.isArray(value)) {
    value.forEach(expectAllFinite);
  } else if (value !== null && typeof value === "object") {
    Object.values(value).forEach(expectAllFinite);
  }
}
