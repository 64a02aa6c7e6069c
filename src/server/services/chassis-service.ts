import {
  countDurationUsageSince,
  findChassisRow,
  findLastMeterOfChassis,
  findLastMeterOfInstallation,
  findLatestRemoval,
  findOpenInstallationOfChassis,
  findOpenInstallationOfEngine,
  listChassisRows,
  listInstallations,
  listOpenInstallations,
  toInstallation,
  type ChassisRow,
} from "../../db/chassis-repo.ts";
import { db } from "../../db/client.ts";
import { findEngineRow } from "../../db/engines-repo.ts";
import { isDuplicateKey, roundOrNull, roundTo, toIso } from "../../db/row-values.ts";
import type { Chassis, Installation } from "../../lib/motors/types.ts";
import type { ChassisCreate, ChassisUpdate, InstallInput, RemoveInput } from "../../lib/schemas/motors.ts";
import { badRequest, conflict, notFound } from "../errors.ts";
import { writeAudit } from "./audit.ts";
import {
  dayIn,
  describeChanges,
  loadOrgSettings,
  meterMatchesUnit,
  parseInstant,
  requireNotFutureInstant,
  type Actor,
} from "./motors-common.ts";

const NO_CHASSIS = "No chassis with that id in this organisation.";

async function toChassisList(organisationId: number, rows: ChassisRow[]): Promise<Chassis[]> {
  const ids = rows.map((r) => Number(r.id));
  const open = new Map((await listOpenInstallations(organisationId, ids)).map((i) => [Number(i.chassis_id), toInstallation(i)]));
  const meters = await findLastMeterOfChassis(ids);
  return rows.map((r) => ({
    id: Number(r.id),
    number: r.number,
    kind: r.kind,
    meterKind: r.meter_kind,
    notes: r.notes,
    archivedAt: toIso(r.archived_at),
    current: open.get(Number(r.id)) ?? null,
    lastMeterReading: meters.get(Number(r.id)) ?? null,
  }));
}

export async function listChassis(organisationId: number, q: { search?: string; includeArchived?: boolean }): Promise<Chassis[]> {
  return toChassisList(organisationId, await listChassisRows(organisationId, q));
}

export async function getChassis(organisationId: number, id: number): Promise<{ chassis: Chassis; installations: Installation[] }> {
  const row = await findChassisRow(organisationId, id);
  if (!row) throw notFound(NO_CHASSIS);
  const [chassis] = await toChassisList(organisationId, [row]);
  const installations = (await listInstallations(organisationId, { chassisId: id })).map(toInstallation);
  return { chassis, installations };
}

function duplicateNumber(err: unknown): never {
  if (isDuplicateKey(err)) throw conflict("Another chassis has this number.", { number: "Another chassis has this number." });
  throw err;
}

export async function createChassis(actor: Actor, input: ChassisCreate): Promise<Chassis> {
  const organisationId = actor.membership.organisationId;
  const id = await db()
    .transaction(async (trx) => {
      const [newId] = await trx("chassis").insert({
        organisation_id: organisationId,
        number: input.number,
        kind: input.kind,
        meter_kind: input.meterKind ?? "none",
        notes: input.notes ?? null,
      });
      await writeAudit(trx, {
        organisationId,
        actorUserId: actor.userId,
        action: "chassis.created",
        entity: "chassis",
        entityId: newId,
        details: { number: input.number },
      });
      return Number(newId);
    })
    .catch(duplicateNumber);
  return (await getChassis(organisationId, id)).chassis;
}

export async function updateChassis(actor: Actor, id: number, input: ChassisUpdate): Promise<Chassis> {
  const organisationId = actor.membership.organisationId;
  const { archived, ...fields } = input;
  await db()
    .transaction(async (trx) => {
      const row = await findChassisRow(organisationId, id, trx, { forUpdate: true });
      if (!row) throw notFound(NO_CHASSIS);
      if (archived === true && (await findOpenInstallationOfChassis(id, trx))) {
        throw conflict("An engine is installed in this chassis: remove it first.", { archived: "an engine is installed" });
      }
      const columns: Record<string, unknown> = {};
      if (fields.number !== undefined) columns.number = fields.number;
      if (fields.kind !== undefined) columns.kind = fields.kind;
      if (fields.meterKind !== undefined) columns.meter_kind = fields.meterKind;
      if (fields.notes !== undefined) columns.notes = fields.notes;
      if (archived !== undefined) columns.archived_at = archived ? (row.archived_at ?? actor.now) : null;
      const changes = describeChanges(
        { number: row.number, kind: row.kind, meterKind: row.meter_kind, notes: row.notes },
        fields as Record<string, unknown>,
      );
      if (archived !== undefined && archived !== (row.archived_at !== null))
        changes.archived = { from: row.archived_at !== null, to: archived };
      if (Object.keys(changes).length === 0) return;
      await trx("chassis")
        .where({ id })
        .update({ ...columns, updated_at: trx.fn.now() });
      await writeAudit(trx, {
        organisationId,
        actorUserId: actor.userId,
        action: "chassis.updated",
        entity: "chassis",
        entityId: id,
        details: changes,
      });
    })
    .catch(duplicateNumber);
  return (await getChassis(organisationId, id)).chassis;
}

function requireMeterAllowed(chassis: ChassisRow, value: number | null | undefined, field: string): void {
  if (value != null && chassis.meter_kind === "none")
    throw badRequest("This chassis has no meter.", { [field]: "This chassis has no meter." });
}

/**
 * Puts an engine into a chassis. Engine and chassis rows are locked (always engine first, then
 * chassis, as removal does) so two crews cannot fill the same place; the unique generated
 * columns of installations stop it even if a writer skips the locks.
 */
export async function installEngine(actor: Actor, chassisId: number, input: InstallInput): Promise<Installation> {
  const organisationId = actor.membership.organisationId;
  const installedAt = parseInstant(input.installedAt, actor.now);
  requireNotFutureInstant("installedAt", installedAt, actor.now);
  const id = await db()
    .transaction(async (trx) => {
      const engine = await findEngineRow(organisationId, input.engineId, trx, { forUpdate: true });
      const chassis = await findChassisRow(organisationId, chassisId, trx, { forUpdate: true });
      if (!chassis) throw notFound(NO_CHASSIS);
      if (!engine)
        throw badRequest("No engine with that id in this organisation.", { engineId: "No engine with that id in this organisation." });
      if (chassis.archived_at) throw conflict("This chassis is archived.");
      if (engine.archived_at || engine.status === "retired")
        throw conflict(`${engine.name} is retired or archived.`, { engineId: "retired or archived" });
      const engineIn = await findOpenInstallationOfEngine(engine.id, trx, true);
      if (engineIn)
        throw conflict(`${engine.name} is in chassis ${engineIn.chassis_number}: remove it first.`, { engineId: "already installed" });
      const occupant = await findOpenInstallationOfChassis(chassisId, trx, true);
      if (occupant) throw conflict(`Chassis ${chassis.number} holds ${occupant.engine_name}: remove it first.`, { chassisId: "occupied" });
      for (const [column, id] of [
        ["engine_id", engine.id],
        ["chassis_id", chassisId],
      ] as const) {
        const lastRemoval = await findLatestRemoval(column, id, trx);
        if (lastRemoval && installedAt < lastRemoval) {
          throw badRequest("That is before the last removal.", {
            installedAt: `Not before ${lastRemoval.toISOString()} (the last removal).`,
          });
        }
      }
      requireMeterAllowed(chassis, input.meterAtInstall, "meterAtInstall");
      const meter = roundOrNull(input.meterAtInstall, 2);
      const lastMeter = (await findLastMeterOfChassis([chassisId], trx)).get(chassisId);
      if (meter !== null && lastMeter !== undefined && meter < lastMeter) {
        throw badRequest("The meter reads lower than before.", { meterAtInstall: `The chassis meter last read ${lastMeter}.` });
      }
      const [newId] = await trx("installations").insert({
        organisation_id: organisationId,
        engine_id: engine.id,
        chassis_id: chassisId,
        installed_at: installedAt,
        meter_at_install: meter,
        installed_by: actor.userId,
        notes: input.notes ?? null,
      });
      if (engine.status === "spare" || engine.status === "bench") {
        await trx("engines").where({ id: engine.id }).update({ status: "running", updated_at: trx.fn.now() });
      }
      await writeAudit(trx, {
        organisationId,
        actorUserId: actor.userId,
        action: "engine.installed",
        entity: "installation",
        entityId: newId,
        details: { engineId: engine.id, chassisId, installedAt: installedAt.toISOString(), meterAtInstall: meter },
      });
      return Number(newId);
    })
    .catch((err: unknown) => {
      if (isDuplicateKey(err)) throw conflict("The engine or the chassis was just taken by another installation.");
      throw err;
    });
  return (await listInstallations(organisationId, { chassisId })).map(toInstallation).find((i) => i.id === id) as Installation;
}

/**
 * Takes the engine out. With a meter that counts in the organisation's unit, the usage since
 * the last meter value on this installation is written as a meter usage entry, unless this
 * installation's usage was logged as durations (then the meter value is only recorded).
 */
export async function removeEngine(actor: Actor, chassisId: number, input: RemoveInput): Promise<Installation> {
  const organisationId = actor.membership.organisationId;
  const settings = await loadOrgSettings(organisationId);
  const removedAt = parseInstant(input.removedAt, actor.now);
  requireNotFutureInstant("removedAt", removedAt, actor.now);
  const installationId = await db().transaction(async (trx) => {
    const peek = await findOpenInstallationOfChassis(chassisId, trx);
    const chassisExists = await findChassisRow(organisationId, chassisId, trx);
    if (!chassisExists) throw notFound(NO_CHASSIS);
    if (!peek) throw conflict("No engine is installed in this chassis.");
    const engine = await findEngineRow(organisationId, Number(peek.engine_id), trx, { forUpdate: true });
    const chassis = (await findChassisRow(organisationId, chassisId, trx, { forUpdate: true })) as ChassisRow;
    const inst = await findOpenInstallationOfChassis(chassisId, trx, true);
    if (!inst || !engine || Number(inst.engine_id) !== Number(engine.id))
      throw conflict("The installation changed meanwhile: reload and try again.");
    if (removedAt < new Date(inst.installed_at)) {
      throw badRequest("That is before the engine went in.", { removedAt: `Not before ${new Date(inst.installed_at).toISOString()}.` });
    }
    requireMeterAllowed(chassis, input.meterAtRemoval, "meterAtRemoval");
    const meter = roundOrNull(input.meterAtRemoval, 2);
    const lastMeter = await findLastMeterOfInstallation(Number(inst.id), trx);
    if (meter !== null && lastMeter !== null && meter < lastMeter) {
      throw badRequest("The meter reads lower than before.", { meterAtRemoval: `The meter last read ${lastMeter} on this installation.` });
    }
    await trx("installations")
      .where({ id: inst.id })
      .update({
        removed_at: removedAt,
        meter_at_removal: meter,
        removed_by: actor.userId,
        updated_at: trx.fn.now(),
        ...(input.notes ? { notes: input.notes } : {}),
      });
    let usageAdded = 0;
    const installedDay = dayIn(new Date(inst.installed_at), settings.timeZone);
    const countsByMeter = (await countDurationUsageSince(Number(engine.id), installedDay, trx)) === 0;
    if (
      countsByMeter &&
      meter !== null &&
      lastMeter !== null &&
      meter > lastMeter &&
      meterMatchesUnit(chassis.meter_kind, settings.usageUnit)
    ) {
      usageAdded = roundTo(meter - lastMeter, 2);
      await trx("usage_entries").insert({
        organisation_id: organisationId,
        engine_id: engine.id,
        occurred_on: dayIn(removedAt, settings.timeZone),
        session_label: "Meter at removal",
        amount: usageAdded,
        source: "meter",
        installation_id: inst.id,
        meter_reading: meter,
        logged_by: actor.userId,
      });
    }
    const status = input.status ?? "bench";
    if (status !== engine.status) await trx("engines").where({ id: engine.id }).update({ status, updated_at: trx.fn.now() });
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: "engine.removed",
      entity: "installation",
      entityId: inst.id,
      details: { engineId: Number(engine.id), chassisId, removedAt: removedAt.toISOString(), meterAtRemoval: meter, usageAdded, status },
    });
    return Number(inst.id);
  });
  return (await listInstallations(organisationId, { chassisId })).map(toInstallation).find((i) => i.id === installationId) as Installation;
}
