import { requestSignalCheck } from "../signals/request.ts";
import {
  countDurationUsageSince,
  findChassisRow,
  findLastMeterOfInstallation,
  findOpenInstallationOfEngine,
} from "../../db/chassis-repo.ts";
import type { Knex } from "knex";
import { db } from "../../db/client.ts";
import { findEngineRow } from "../../db/engines-repo.ts";
import { roundTo, toNumber } from "../../db/row-values.ts";
import { filteredUsage, findUsageRow, toUsageEntry, withUsageNames } from "../../db/usage-repo.ts";
import type { UsageEntry } from "../../lib/motors/types.ts";
import type { UsageListQuery, UsageLogInput } from "../../lib/schemas/motors.ts";
import { badRequest, conflict, notFound } from "../errors.ts";
import { writeAudit } from "./audit.ts";
import { dayIn, loadOrgSettings, meterMatchesUnit, pageOf, requireNotAfterToday, roundUsage, type Actor } from "./motors-common.ts";

const NO_ENTRY = "No usage entry with that id in this organisation.";

export async function listUsage(
  organisationId: number,
  q: UsageListQuery,
): Promise<{ entries: UsageEntry[]; page: number; perPage: number; total: number; totalAmount: number; unit: UsageEntry["unit"] }> {
  const { page, perPage, offset } = pageOf(q, 100);
  const settings = await loadOrgSettings(organisationId);
  const agg = (await filteredUsage(organisationId, q).count({ n: "*" }).sum({ s: "ue.amount" }).first()) as
    { n?: unknown; s?: unknown } | undefined;
  const rows = await withUsageNames(filteredUsage(organisationId, q))
    .orderBy("ue.occurred_on", "desc")
    .orderBy("ue.id", "desc")
    .limit(perPage)
    .offset(offset);
  return {
    entries: rows.map((r: Record<string, any>) => toUsageEntry(r, settings.usageUnit)),
    page,
    perPage,
    total: Number(agg?.n ?? 0),
    totalAmount: roundUsage(toNumber(agg?.s)),
    unit: settings.usageUnit,
  };
}

export async function getUsage(organisationId: number, id: number, k: Knex = db()): Promise<UsageEntry> {
  const row = await findUsageRow(organisationId, id, k);
  if (!row) throw notFound(NO_ENTRY);
  const settings = await loadOrgSettings(organisationId, k);
  return toUsageEntry(row, settings.usageUnit);
}

/**
 * Logs usage for one engine: a duration (amount) or a reading of the meter of the chassis the
 * engine is in, whose difference from the last reading on this installation becomes the amount.
 */
export async function logUsage(actor: Actor, input: UsageLogInput): Promise<UsageEntry> {
  const organisationId = actor.membership.organisationId;
  const settings = await loadOrgSettings(organisationId);
  requireNotAfterToday("occurredOn", input.occurredOn, actor.now, settings.timeZone);
  return db().transaction(async (trx) => {
    // First, before any insert takes a shared lock on the organisation row (src/server/signals/request.ts).
    await requestSignalCheck(trx, organisationId, actor.now);
    const engine = await findEngineRow(organisationId, input.engineId, trx, { forUpdate: true });
    if (!engine)
      throw badRequest("No engine with that id in this organisation.", { engineId: "No engine with that id in this organisation." });
    if (engine.archived_at || engine.status === "retired")
      throw conflict(`${engine.name} is retired or archived: it logs no usage.`, { engineId: "retired or archived" });
    let amount: number;
    let meter: { installationId: number; reading: number } | null = null;
    if (input.meterReading !== undefined) {
      const inst = await findOpenInstallationOfEngine(engine.id, trx, true);
      if (!inst) throw conflict(`${engine.name} is not in a chassis: log the usage as a duration.`, { meterReading: "not installed" });
      const chassis = await findChassisRow(organisationId, Number(inst.chassis_id), trx);
      if (!chassis || !meterMatchesUnit(chassis.meter_kind, settings.usageUnit)) {
        throw conflict(`Chassis ${inst.chassis_number} has no meter in ${settings.usageUnit}.`, { meterReading: "no matching meter" });
      }
      const installedDay = dayIn(new Date(inst.installed_at), settings.timeZone);
      if (input.occurredOn < installedDay) {
        throw badRequest("That is before the engine went into this chassis.", { occurredOn: "before the installation" });
      }
      if ((await countDurationUsageSince(engine.id, installedDay, trx)) > 0) {
        throw conflict("Usage in this chassis is logged as durations: keep logging durations, or the same running counts twice.", {
          meterReading: "usage here is logged as durations",
        });
      }
      const reading = roundTo(input.meterReading, 2);
      const last = await findLastMeterOfInstallation(Number(inst.id), trx);
      if (last === null)
        throw conflict("The meter was not read at installation: log the usage as a duration.", { meterReading: "no starting reading" });
      if (reading < last) throw badRequest("The meter reads lower than before.", { meterReading: `The meter last read ${last}.` });
      amount = roundTo(reading - last, 2);
      meter = { installationId: Number(inst.id), reading };
    } else {
      const inst = await findOpenInstallationOfEngine(engine.id, trx);
      const metered = inst
        ? await trx("usage_entries").where({ installation_id: inst.id, source: "meter" }).whereNull("archived_at").first("id")
        : undefined;
      if (inst && metered) {
        throw conflict(
          `Usage in chassis ${inst.chassis_number} is counted by its meter: log a meter reading, or the same running counts twice.`,
          {
            amount: "usage here is counted by the meter",
          },
        );
      }
      amount = roundTo(input.amount as number, 2);
    }
    const [newId] = await trx("usage_entries").insert({
      organisation_id: organisationId,
      engine_id: engine.id,
      occurred_on: input.occurredOn,
      session_label: input.sessionLabel ?? null,
      event_label: input.eventLabel ?? null,
      amount,
      source: meter ? "meter" : "manual",
      installation_id: meter?.installationId ?? null,
      meter_reading: meter?.reading ?? null,
      logged_by: actor.userId,
      notes: input.notes ?? null,
    });
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: "usage.logged",
      entity: "usage_entry",
      entityId: newId,
      details: { engineId: engine.id, occurredOn: input.occurredOn, amount, meterReading: meter?.reading ?? null },
    });
    // Read back before the commit: once committed, a lost connection must not turn a saved write into a 503.
    return getUsage(organisationId, Number(newId), trx);
  });
}

/** Usage is never deleted: a wrong entry is archived and stops counting (or is restored). */
export async function archiveUsage(actor: Actor, id: number, archived: boolean): Promise<UsageEntry> {
  const organisationId = actor.membership.organisationId;
  return db().transaction(async (trx) => {
    // First, before any insert takes a shared lock on the organisation row (src/server/signals/request.ts).
    await requestSignalCheck(trx, organisationId, actor.now);
    const row = await findUsageRow(organisationId, id, trx, true);
    if (!row) throw notFound(NO_ENTRY);
    if ((row.archived_at !== null) === archived) return getUsage(organisationId, id, trx);
    await trx("usage_entries")
      .where({ id })
      .update({ archived_at: archived ? actor.now : null, updated_at: trx.fn.now() });
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: archived ? "usage.archived" : "usage.restored",
      entity: "usage_entry",
      entityId: id,
      details: { engineId: Number(row.engine_id), amount: toNumber(row.amount), occurredOn: row.occurred_on },
    });
    return getUsage(organisationId, id, trx);
  });
}
