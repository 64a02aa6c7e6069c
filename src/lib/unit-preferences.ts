import { IMPERIAL_UNITS, METRIC_UNITS, type UnitChoice } from "./domain/units.ts";

// Which units a person reads and types in: their own per-quantity choices, filled in from
// their own system, else from the organisation's. Shared by the server and the Workbench.

export type UnitSystemName = "metric" | "imperial";

export const UNIT_OPTIONS = {
  length: ["mm", "in"],
  volume: ["cc", "in3"],
  pressure: ["kPa", "bar", "psi"],
  elevation: ["m", "ft"],
  temperature: ["C", "F"],
} as const satisfies { [K in keyof UnitChoice]: readonly UnitChoice[K][] };

export type UnitQuantity = keyof UnitChoice;
export const UNIT_QUANTITIES = Object.keys(UNIT_OPTIONS) as UnitQuantity[];

export interface UnitPreferences {
  /** The person's own system; null follows the organisation. */
  unitSystem: UnitSystemName | null;
  /** Per-quantity choices that override the system; null when none were made. */
  unitChoices: Partial<UnitChoice> | null;
}

export function isUnitOption<K extends UnitQuantity>(quantity: K, value: unknown): value is UnitChoice[K] {
  return (UNIT_OPTIONS[quantity] as readonly unknown[]).includes(value);
}

/** Keeps only known quantities with known units, so a hand-edited or older value cannot break a page. */
export function readUnitChoices(value: unknown): Partial<UnitChoice> | null {
  let parsed = value;
  if (typeof value === "string") {
    try {
      parsed = JSON.parse(value);
    } catch {
      return null;
    }
  }
  if (!parsed || typeof parsed !== "object" || Array.isArray(parsed)) return null;
  const out: Partial<Record<UnitQuantity, string>> = {};
  for (const quantity of UNIT_QUANTITIES) {
    const unit = (parsed as Record<string, unknown>)[quantity];
    if (isUnitOption(quantity, unit)) out[quantity] = unit;
  }
  return Object.keys(out).length > 0 ? (out as Partial<UnitChoice>) : null;
}

export function resolveUnitPreferences(preferences: UnitPreferences, organisationSystem: UnitSystemName | null): UnitChoice {
  const system = preferences.unitSystem ?? organisationSystem ?? "metric";
  const base = system === "imperial" ? IMPERIAL_UNITS : METRIC_UNITS;
  return { ...base, ...(preferences.unitChoices ?? {}) };
}
