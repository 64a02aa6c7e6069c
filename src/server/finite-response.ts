import { HttpError } from "./errors.ts";

// JSON.stringify writes NaN and Infinity as null, so a figure that overflowed would reach a
// client as a silent null. The calculation routes pass every answer through here first.

/** The dotted path of the first number in `value` that is NaN or ±Infinity, or null. */
export function findNonFiniteNumber(value: unknown, path = ""): string | null {
  if (typeof value === "number") return Number.isFinite(value) ? null : path || "result";
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i += 1) {
      const found = findNonFiniteNumber(value[i], `${path}[${i}]`);
      if (found) return found;
    }
    return null;
  }
  if (value && typeof value === "object") {
    for (const [key, inner] of Object.entries(value)) {
      const found = findNonFiniteNumber(inner, path ? `${path}.${key}` : key);
      if (found) return found;
    }
  }
  return null;
}

/** Returns `body` unchanged, or refuses with a 400 naming the figure that left the finite numbers. */
export function requireFiniteResponse<T>(body: T): T {
  const path = findNonFiniteNumber(body);
  if (path !== null) {
    throw new HttpError(400, "out_of_range", "These values lead to a figure too large to compute. Check the inputs.", {
      [path]: "this figure is out of range for these inputs",
    });
  }
  return body;
}
