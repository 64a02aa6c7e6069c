import type { UnitChoice } from "../../lib/domain/units.ts";
import { resolveUnitPreferences, type UnitPreferences, type UnitSystemName } from "../../lib/unit-preferences.ts";
import { findOrganisationUnitSystem, findUserUnitPreferences, updateUserUnitPreferences } from "../../db/user-preferences-repo.ts";
import type { PreferencesPatch } from "../../lib/schemas/preferences.ts";
import { notFound } from "../errors.ts";

export interface UnitPreferencesView extends UnitPreferences {
  /** The active organisation's system, the fallback; null without a membership. */
  organisationUnitSystem: UnitSystemName | null;
  /** What the person actually reads and types in. */
  units: UnitChoice;
}

export async function loadUnitPreferences(userId: string, organisationId: number | null): Promise<UnitPreferencesView> {
  const own = await findUserUnitPreferences(userId);
  if (!own) throw notFound("No such person.");
  const organisationUnitSystem = organisationId === null ? null : await findOrganisationUnitSystem(organisationId);
  return { ...own, organisationUnitSystem, units: resolveUnitPreferences(own, organisationUnitSystem) };
}

/** One row, one statement: a person's own preference, not an organisation change, so no audit entry. */
export async function saveUnitPreferences(
  userId: string,
  organisationId: number | null,
  change: PreferencesPatch,
): Promise<UnitPreferencesView> {
  const patch: Partial<UnitPreferences> = {};
  if (change.unitSystem !== undefined) patch.unitSystem = change.unitSystem;
  if (change.unitChoices !== undefined) {
    const choices =
      change.unitChoices === null ? {} : Object.fromEntries(Object.entries(change.unitChoices).filter(([, v]) => v !== undefined));
    patch.unitChoices = Object.keys(choices).length > 0 ? (choices as Partial<UnitChoice>) : null;
  }
  const updated = await updateUserUnitPreferences(userId, patch);
  if (updated !== 1) throw notFound("No such person.");
  return loadUnitPreferences(userId, organisationId);
}
