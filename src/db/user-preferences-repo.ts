import type { Knex } from "knex";
import { readUnitChoices, type UnitPreferences } from "../lib/unit-preferences.ts";
import { db } from "./client.ts";

interface Row {
  unit_system: "metric" | "imperial" | null;
  unit_choices: unknown;
}

export async function findUserUnitPreferences(userId: string, trx: Knex = db()): Promise<UnitPreferences | null> {
  const row: Row | undefined = await trx("users").where({ id: userId }).first("unit_system", "unit_choices");
  if (!row) return null;
  return { unitSystem: row.unit_system ?? null, unitChoices: readUnitChoices(row.unit_choices) };
}

/** Writes only the keys present in `change`; a null clears that preference. */
export async function updateUserUnitPreferences(userId: string, change: Partial<UnitPreferences>, trx: Knex = db()): Promise<number> {
  const row: Record<string, unknown> = { updated_at: trx.fn.now() };
  if (change.unitSystem !== undefined) row.unit_system = change.unitSystem;
  if (change.unitChoices !== undefined) row.unit_choices = change.unitChoices === null ? null : JSON.stringify(change.unitChoices);
  return trx("users").where({ id: userId }).update(row);
}

export async function findOrganisationUnitSystem(organisationId: number, trx: Knex = db()): Promise<"metric" | "imperial" | null> {
  const row = await trx("organisations").where({ id: organisationId }).first("unit_system");
  return row?.unit_system ?? null;
}
