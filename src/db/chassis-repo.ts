import type { Knex } from "knex";
import type { Chassis, Installation } from "../lib/motors/types.ts";
import { db } from "./client.ts";
import { likeTerm, toIso, toNumberOrNull } from "./row-values.ts";

export interface ChassisRow {
  id: number;
  organisation_id: number;
  number: string;
  kind: Chassis["kind"];
  meter_kind: Chassis["meterKind"];
  notes: string | null;
  archived_at: Date | null;
}

export interface InstallationRow {
  id: number;
  organisation_id: number;
  engine_id: number;
  chassis_id: number;
  installed_at: Date;
  removed_at: Date | null;
  meter_at_install: number | null;
  meter_at_removal: number | null;
  notes: string | null;
  engine_name?: string;
  chassis_number?: string;
}

export function toInstallation(r: InstallationRow): Installation {
  return {
    id: Number(r.id),
    engineId: Number(r.engine_id),
    engineName: r.engine_name ?? "",
    chassisId: Number(r.chassis_id),
    chassisNumber: r.chassis_number ?? "",
    installedAt: toIso(r.installed_at) ?? "",
    removedAt: toIso(r.removed_at),
    meterAtInstall: toNumberOrNull(r.meter_at_install),
    meterAtRemoval: toNumberOrNull(r.meter_at_removal),
    notes: r.notes,
  };
}

export async function findChassisRow(
  organisationId: number,
  id: number,
  k: Knex = db(),
  opts: { forUpdate?: boolean } = {},
): Promise<ChassisRow | undefined> {
  const q = k<ChassisRow>("chassis").where({ organisation_id: organisationId, id });
  if (opts.forUpdate) q.forUpdate();
  return q.first();
}

export async function listChassisRows(
  organisationId: number,
  opts: { search?: string; includeArchived?: boolean },
  k: Knex = db(),
): Promise<ChassisRow[]> {
  const q = k<ChassisRow>("chassis").where({ organisation_id: organisationId });
  if (!opts.includeArchived) q.whereNull("archived_at");
  if (opts.search) q.where("number", "like", likeTerm(opts.search));
  // Numbers are usually numeric: #9 before #27 before #114.
  return q.orderByRaw("LENGTH(number), number");
}

function installationQuery(k: Knex): Knex.QueryBuilder {
  return k("installations as i")
    .join("engines as e", "e.id", "i.engine_id")
    .join("chassis as c", "c.id", "i.chassis_id")
    .select("i.*", "e.name as engine_name", "c.number as chassis_number");
}

/** The open installation of an engine, locked for the rest of the transaction when asked. */
export async function findOpenInstallationOfEngine(engineId: number, k: Knex = db(), forUpdate = false): Promise<InstallationRow | undefined> {
  const q = installationQuery(k).where("i.engine_id", engineId).whereNull("i.removed_at");
  if (forUpdate) q.forUpdate();
  return q.first();
}

export async function findOpenInstallationOfChassis(chassisId: number, k: Knex = db(), forUpdate = false): Promise<InstallationRow | undefined> {
  const q = installationQuery(k).where("i.chassis_id", chassisId).whereNull("i.removed_at");
  if (forUpdate) q.forUpdate();
  return q.first();
}

export async function listOpenInstallations(organisationId: number, chassisIds: number[], k: Knex = db()): Promise<InstallationRow[]> {
  if (chassisIds.length === 0) return [];
  return installationQuery(k).where("i.organisation_id", organisationId).whereIn("i.chassis_id", chassisIds).whereNull("i.removed_at");
}

export async function listInstallations(
  organisationId: number,
  filter: { engineId?: number; chassisId?: number },
  k: Knex = db(),
): Promise<InstallationRow[]> {
  const q = installationQuery(k).where("i.organisation_id", organisationId);
  if (filter.engineId !== undefined) q.where("i.engine_id", filter.engineId);
  if (filter.chassisId !== undefined) q.where("i.chassis_id", filter.chassisId);
  return q.orderBy("i.installed_at", "desc").orderBy("i.id", "desc");
}

/** The latest end of any earlier installation of this engine or chassis: a new one may not start before it. */
export async function findLatestRemoval(column: "engine_id" | "chassis_id", id: number, k: Knex = db()): Promise<Date | null> {
  const row = await k("installations").where(column, id).whereNotNull("removed_at").max({ at: "removed_at" }).first();
  return row?.at ? new Date(row.at) : null;
}

/** The highest meter value recorded on an installation (at install or by a meter usage entry). */
export async function findLastMeterOfInstallation(installationId: number, k: Knex = db()): Promise<number | null> {
  const inst = await k("installations").where({ id: installationId }).first("meter_at_install");
  const logged = await k("usage_entries").where({ installation_id: installationId }).whereNull("archived_at").max({ m: "meter_reading" }).first();
  const values = [toNumberOrNull(inst?.meter_at_install), toNumberOrNull(logged?.m)].filter((v): v is number => v !== null);
  return values.length ? Math.max(...values) : null;
}

/** The last meter value known per chassis: the latest of install, logged readings and removal. */
export async function findLastMeterOfChassis(chassisIds: number[], k: Knex = db()): Promise<Map<number, number>> {
  if (chassisIds.length === 0) return new Map();
  const [rows] = (await k.raw(
    `SELECT i.chassis_id, GREATEST(COALESCE(MAX(i.meter_at_install), 0), COALESCE(MAX(i.meter_at_removal), 0), COALESCE(MAX(u.meter_reading), 0)) AS m,
            COUNT(i.meter_at_install) + COUNT(i.meter_at_removal) + COUNT(u.meter_reading) AS n
       FROM installations i LEFT JOIN usage_entries u ON u.installation_id = i.id AND u.archived_at IS NULL
      WHERE i.chassis_id IN (?) GROUP BY i.chassis_id`,
    [chassisIds],
  )) as [Record<string, unknown>[]];
  return new Map(rows.filter((r) => Number(r.n) > 0).map((r) => [Number(r.chassis_id), Number(r.m)]));
}

/**
 * Usage logged as durations (or imported) for this engine since the installation's day: when
 * there is some, the meter is not also counted, or the same running would count twice.
 */
export async function countDurationUsageSince(engineId: number, sinceDay: string, k: Knex = db()): Promise<number> {
  const row = await k("usage_entries")
    .where({ engine_id: engineId })
    .whereNot("source", "meter")
    .whereNull("archived_at")
    .where("occurred_on", ">=", sinceDay)
    .count<{ n: number }[]>({ n: "*" })
    .first();
  return Number(row?.n ?? 0);
}
