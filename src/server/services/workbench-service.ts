import type { FuelTable } from "../../lib/domain/fuel.ts";
import type { UnitChoice } from "../../lib/domain/units.ts";
import { loadUnitPreferences } from "./preferences-service.ts";
import { loadSettings } from "./settings-service.ts";

export type FuelTableSource = "request" | "organisation" | "seed-defaults";

/**
 * The organisation's own fuel table, or null while it still runs on the seed defaults (the
 * domain then adds the caution that asks the team to review them).
 */
export async function loadOrganisationFuelTable(organisationId: number): Promise<FuelTable | null> {
  const settings = await loadSettings(organisationId);
  return settings.fuelTableEdited ? settings.fuelTable : null;
}

export interface WorkbenchStart {
  units: UnitChoice;
  shopElevationM: number | null;
  fuelTable: FuelTable | null;
}

/** What the Workbench needs from the server before its first render. */
export async function loadWorkbenchStart(userId: string, organisationId: number): Promise<WorkbenchStart> {
  const [preferences, settings] = await Promise.all([loadUnitPreferences(userId, organisationId), loadSettings(organisationId)]);
  return {
    units: preferences.units,
    shopElevationM: settings.shopElevationM == null ? null : Number(settings.shopElevationM),
    fuelTable: settings.fuelTableEdited ? settings.fuelTable : null,
  };
}
