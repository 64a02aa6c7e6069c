import cron from "node-cron";
import { db } from "../../db/client.ts";
import { DEFAULT_FUEL_TABLE } from "../../lib/domain/fuel.ts";
import type { FuelTable } from "../../lib/domain/fuel.ts";
import { DEFAULT_THRESHOLDS, mergeThresholds } from "../../lib/domain/signal-rules/thresholds.ts";
import type { SignalThresholds } from "../../lib/domain/signal-rules/types.ts";
import { DomainInputError } from "../../lib/domain/errors.ts";
import { badRequest } from "../errors.ts";
import { writeAudit } from "./audit.ts";

export interface OrganisationSettings {
  name: string;
  timeZone: string;
  usageUnit: "hours" | "kilometres" | "laps" | "litres";
  unitSystem: "metric" | "imperial";
  shopElevationM: number | null;
  chamberToleranceCc: number;
  schedule: string;
  thresholds: SignalThresholds;
  thresholdsEdited: boolean;
  fuelTable: FuelTable;
  fuelTableEdited: boolean;
}

function parseJson<T>(value: unknown): T | null {
  if (value == null) return null;
  return (typeof value === "string" ? JSON.parse(value) : value) as T;
}

export async function loadSettings(organisationId: number): Promise<OrganisationSettings> {
  const o = await db()("organisations").where({ id: organisationId }).first();
  const overrides = parseJson<Record<string, Record<string, number>>>(o.signal_thresholds);
  const fuel = parseJson<FuelTable>(o.fuel_table);
  return {
    name: o.name,
    timeZone: o.time_zone,
    usageUnit: o.usage_unit,
    unitSystem: o.unit_system,
    shopElevationM: o.shop_elevation_m,
    chamberToleranceCc: Number(o.chamber_tolerance_cc),
    schedule: o.signal_schedule,
    thresholds: mergeThresholds(overrides as never),
    thresholdsEdited: overrides != null,
    fuelTable: fuel ?? { label: DEFAULT_FUEL_TABLE.label, rows: DEFAULT_FUEL_TABLE.rows.map((r) => ({ ...r })) },
    fuelTableEdited: fuel != null,
  };
}

/** Only the values that differ from the defaults are stored, so improved defaults reach everyone else. */
function thresholdOverrides(thresholds: Record<string, Record<string, number>>): Record<string, Record<string, number>> {
  const out: Record<string, Record<string, number>> = {};
  for (const [group, fields] of Object.entries(thresholds)) {
    const defaults = (DEFAULT_THRESHOLDS as unknown as Record<string, Record<string, number>>)[group];
    if (!defaults || typeof defaults !== "object") continue;
    for (const [name, value] of Object.entries(fields)) {
      if (defaults[name] !== value) (out[group] ??= {})[name] = value;
    }
  }
  return out;
}

export interface SettingsPatch {
  general?: Partial<{ name: string; timeZone: string; usageUnit: OrganisationSettings["usageUnit"]; unitSystem: OrganisationSettings["unitSystem"]; shopElevationM: number | null; chamberToleranceCc: number }>;
  signals?: Partial<{ schedule: string; thresholds: Record<string, Record<string, number>> | null }>;
  fuelTable?: FuelTable | null;
}

export async function updateSettings(organisationId: number, actorUserId: string, patch: SettingsPatch): Promise<OrganisationSettings> {
  const row: Record<string, unknown> = {};
  const g = patch.general;
  if (g) {
    if (g.name !== undefined) row.name = g.name;
    if (g.timeZone !== undefined) row.time_zone = g.timeZone;
    if (g.usageUnit !== undefined) row.usage_unit = g.usageUnit;
    if (g.unitSystem !== undefined) row.unit_system = g.unitSystem;
    if (g.shopElevationM !== undefined) row.shop_elevation_m = g.shopElevationM == null ? null : Math.round(g.shopElevationM);
    if (g.chamberToleranceCc !== undefined) row.chamber_tolerance_cc = g.chamberToleranceCc;
  }
  const s = patch.signals;
  if (s?.schedule !== undefined) {
    if (!cron.validate(s.schedule)) {
      throw badRequest("The schedule is not a valid cron expression.", { "signals.schedule": "use five fields, e.g. 0 6 * * * for 06:00 every day" });
    }
    row.signal_schedule = s.schedule;
  }
  if (s?.thresholds !== undefined) {
    if (s.thresholds === null) row.signal_thresholds = null;
    else {
      const overrides = thresholdOverrides(s.thresholds);
      try {
        mergeThresholds(overrides as never);
      } catch (err) {
        if (err instanceof DomainInputError) throw badRequest(err.message, { [`signals.${err.field}`]: err.message });
        throw err;
      }
      row.signal_thresholds = Object.keys(overrides).length ? JSON.stringify(overrides) : null;
    }
  }
  if (patch.fuelTable !== undefined) {
    if (patch.fuelTable) {
      const rows = [...patch.fuelTable.rows].sort((a, b) => a.upToCrankingKpa - b.upToCrankingKpa);
      const seen = new Set<number>();
      rows.forEach((r, i) => {
        if (seen.has(r.upToCrankingKpa)) throw badRequest("Two rows have the same upper bound.", { [`fuelTable.rows.${i}.upToCrankingKpa`]: "duplicate bound" });
        seen.add(r.upToCrankingKpa);
      });
      row.fuel_table = JSON.stringify({ label: patch.fuelTable.label, rows });
    } else row.fuel_table = null;
  }
  if (Object.keys(row).length > 0) {
    await db().transaction(async (trx) => {
      await trx("organisations").where({ id: organisationId }).update({ ...row, updated_at: trx.fn.now() });
      await writeAudit(trx, {
        organisationId,
        actorUserId,
        action: "settings.changed",
        entity: "organisation",
        entityId: organisationId,
        details: { fields: Object.keys(row) },
      });
    });
  }
  return loadSettings(organisationId);
}
