import { afterEach, beforeEach, vi } from "vitest";

// Tests are loud: an unexpected console.error fails the test that caused it.
let errors: unknown[][] = [];
beforeEach(() => {
  errors = [];
  vi.spyOn(console, "error").mockImplementation((...args: unknown[]) => {
    errors.push(args);
  });
});
afterEach(() => {
  vi.restoreAllMocks();
  if (errors.length > 0) {
    const first = errors[0].map((a) => (a instanceof Error ? a.stack : String(a))).join(" ");
    throw new Error(`unexpected console.error during test: ${first}`);
  }
});
