import type { Knex } from "knex";
import { findOpenInstallationOfEngine, listInstallations, toInstallation } from "../../db/chassis-repo.ts";
import { db } from "../../db/client.ts";
import { loadEngineCounters } from "../../db/counters-repo.ts";
import { ENGINE_COLUMNS, findEngineRow, toEngine, type EngineRow } from "../../db/engines-repo.ts";
import { findRacingClass, toRacingClass } from "../../db/racing-classes-repo.ts";
import { listReadingSetRows } from "../../db/reading-sets-repo.ts";
import { isDuplicateKey, roundOrNull } from "../../db/row-values.ts";
import { insertServiceRecord, listServiceRecords } from "../../db/service-records-repo.ts";
import type { Engine, EngineCounters, Installation, Part, RacingClass, ReadingSet, ServiceRecord } from "../../lib/motors/types.ts";
import { findEngineCrossFieldErrors, type EngineCreate, type EngineUpdate, type ServiceRecordInput } from "../../lib/schemas/motors.ts";
import { badRequest, conflict, notFound } from "../errors.ts";
import { writeAudit } from "./audit.ts";
import { describeChanges, loadOrgSettings, requireNotAfterToday, type Actor } from "./motors-common.ts";
import { listPartsOfEngine } from "./parts-service.ts";
import { assembleReadingSets } from "./readings-service.ts";
import { toEngineCounters } from "./roster-service.ts";

export const NO_ENGINE = "No engine with that id in this organisation.";

/** DECIMAL scales of the engine columns, so values are stored exactly as they will be read back. */
const SCALES: Record<string, number> = {
  boreMm: 3,
  strokeMm: 3,
  rodMm: 3,
  exhaustOpensDegAtdc: 2,
  targetRatio: 2,
  targetSquishMm: 2,
  buildMinOctane: 1,
  topEndLimit: 2,
  bottomEndLimit: 2,
  inspectionInterval: 2,
  planFraction: 2,
};

function toColumns(input: Partial<EngineCreate>): Partial<Record<keyof EngineRow, unknown>> {
  const out: Partial<Record<keyof EngineRow, unknown>> = {};
  for (const [field, column] of Object.entries(ENGINE_COLUMNS)) {
    const value = (input as Record<string, unknown>)[field];
    if (value === undefined) continue;
    out[column] = typeof value === "number" && SCALES[field] !== undefined ? roundOrNull(value, SCALES[field]) : value;
  }
  return out;
}

export async function requireEngineRow(organisationId: number, id: number, k: Knex = db(), forUpdate = false): Promise<EngineRow> {
  const row = await findEngineRow(organisationId, id, k, { forUpdate });
  if (!row) throw notFound(NO_ENGINE);
  return row;
}

async function checkRacingClass(organisationId: number, racingClassId: number | null | undefined, k: Knex): Promise<void> {
  if (racingClassId === null || racingClassId === undefined) return;
  const cls = await findRacingClass(organisationId, racingClassId, k);
  if (!cls || cls.archived_at) throw badRequest("Choose one of this organisation's classes.", { racingClassId: "No such racing class." });
}

function duplicateName(err: unknown): never {
  if (isDuplicateKey(err)) throw conflict("Another engine already has this name.", { name: "Another engine already has this name." });
  throw err;
}

export async function createEngine(actor: Actor, input: EngineCreate): Promise<Engine> {
  const organisationId = actor.membership.organisationId;
  const id = await db()
    .transaction(async (trx) => {
      await checkRacingClass(organisationId, input.racingClassId, trx);
      const [newId] = await trx("engines").insert({ organisation_id: organisationId, ...toColumns(input) });
      await writeAudit(trx, {
        organisationId,
        actorUserId: actor.userId,
        action: "engine.created",
        entity: "engine",
        entityId: newId,
        details: { name: input.name, status: input.status ?? "spare" },
      });
      return Number(newId);
    })
    .catch(duplicateName);
  return toEngine(await requireEngineRow(organisationId, id));
}

export async function updateEngine(actor: Actor, id: number, input: EngineUpdate): Promise<Engine> {
  const organisationId = actor.membership.organisationId;
  const { archived, ...fields } = input;
  await db()
    .transaction(async (trx) => {
      const row = await requireEngineRow(organisationId, id, trx, true);
      const before = toEngine(row);
      const merged = { ...before, ...Object.fromEntries(Object.entries(fields).filter(([, v]) => v !== undefined)) };
      const errors = findEngineCrossFieldErrors(merged);
      if (Object.keys(errors).length) throw badRequest("Some fields do not fit together.", errors);
      await checkRacingClass(organisationId, fields.racingClassId, trx);
      const installed = await findOpenInstallationOfEngine(id, trx);
      if (installed && (fields.status === "retired" || archived === true)) {
        throw conflict(`${before.name} is in chassis ${installed.chassis_number}: remove it first.`, { status: "installed in a chassis" });
      }
      const columns = toColumns(fields);
      if (archived !== undefined) columns.archived_at = archived ? (row.archived_at ?? actor.now) : null;
      const changes = describeChanges(before as unknown as Record<string, unknown>, fields as Record<string, unknown>);
      if (archived !== undefined && archived !== (row.archived_at !== null))
        changes.archived = { from: row.archived_at !== null, to: archived };
      if (Object.keys(changes).length === 0) return;
      await trx("engines")
        .where({ id })
        .update({ ...columns, updated_at: trx.fn.now() });
      const action =
        archived === true && row.archived_at === null
          ? "engine.archived"
          : archived === false && row.archived_at !== null
            ? "engine.restored"
            : "engine.updated";
      await writeAudit(trx, { organisationId, actorUserId: actor.userId, action, entity: "engine", entityId: id, details: changes });
    })
    .catch(duplicateName);
  return toEngine(await requireEngineRow(organisationId, id));
}

export async function archiveEngine(actor: Actor, id: number): Promise<Engine> {
  return updateEngine(actor, id, { archived: true });
}

export interface EngineFile {
  engine: Engine;
  racingClass: RacingClass | null;
  installation: Installation | null;
  installations: Installation[];
  counters: EngineCounters;
  parts: Part[];
  services: ServiceRecord[];
  latestReadingSet: ReadingSet | null;
  baselineReadingSet: ReadingSet | null;
}

/** Everything the engine file shows at the top: spec, where it is, counters, parts, latest and baseline readings. */
export async function getEngineFile(organisationId: number, id: number): Promise<EngineFile> {
  const row = await requireEngineRow(organisationId, id);
  const engine = toEngine(row);
  const settings = await loadOrgSettings(organisationId);
  const cls = engine.racingClassId ? await findRacingClass(organisationId, engine.racingClassId) : undefined;
  const installations = (await listInstallations(organisationId, { engineId: id })).map(toInstallation);
  const latest = await listReadingSetRows(organisationId, { engineId: id }, { limit: 1, offset: 0 });
  const baseline = await listReadingSetRows(organisationId, { engineId: id, baselineOnly: true }, { limit: 1, offset: 0 });
  const sets = await assembleReadingSets(organisationId, [...latest.rows, ...baseline.rows], db(), { withUploads: true, withUsage: true });
  return {
    engine,
    racingClass: cls ? toRacingClass(cls) : null,
    installation: installations.find((i) => i.removedAt === null) ?? null,
    installations,
    counters: await getEngineCounters(organisationId, engine, settings.usageUnit),
    parts: await listPartsOfEngine(organisationId, id),
    services: await listServiceRecords(organisationId, id),
    latestReadingSet: latest.rows.length ? sets[0] : null,
    baselineReadingSet: baseline.rows.length ? sets[latest.rows.length] : null,
  };
}

export async function getEngineCounters(organisationId: number, engine: Engine, unit: EngineCounters["unit"]): Promise<EngineCounters> {
  const counters = await loadEngineCounters(organisationId, [engine.id]);
  return toEngineCounters(
    counters.get(engine.id),
    {
      topEnd: engine.topEndLimit,
      bottomEnd: engine.bottomEndLimit,
      inspection: engine.inspectionInterval,
      planFraction: engine.planFraction,
    },
    unit,
  );
}

/** GET engines/[id]/counters: the engine's and each installed part's counters. */
export async function describeCounters(
  organisationId: number,
  id: number,
): Promise<{ engineId: number; counters: EngineCounters; parts: Part[] }> {
  const engine = toEngine(await requireEngineRow(organisationId, id));
  const settings = await loadOrgSettings(organisationId);
  return {
    engineId: id,
    counters: await getEngineCounters(organisationId, engine, settings.usageUnit),
    parts: await listPartsOfEngine(organisationId, id),
  };
}

export async function listEngineServices(organisationId: number, id: number, includeArchived: boolean): Promise<ServiceRecord[]> {
  await requireEngineRow(organisationId, id);
  return listServiceRecords(organisationId, id, includeArchived);
}

/** A rebuild or inspection done outside a bench job; counters restart the day after it. */
export async function recordService(actor: Actor, engineId: number, input: ServiceRecordInput): Promise<ServiceRecord> {
  const organisationId = actor.membership.organisationId;
  const settings = await loadOrgSettings(organisationId);
  requireNotAfterToday("doneOn", input.doneOn, actor.now, settings.timeZone);
  const id = await db().transaction(async (trx) => {
    const engine = await requireEngineRow(organisationId, engineId, trx, true);
    if (engine.archived_at) throw conflict("This engine is archived.");
    const serviceId = await insertServiceRecord(trx, {
      organisation_id: organisationId,
      engine_id: engineId,
      kind: input.kind,
      done_on: input.doneOn,
      done_by: actor.userId,
      notes: input.notes ?? null,
    });
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: "service.recorded",
      entity: "service",
      entityId: serviceId,
      details: { engineId, kind: input.kind, doneOn: input.doneOn },
    });
    return serviceId;
  });
  const all = await listServiceRecords(organisationId, engineId, true);
  return all.find((s) => s.id === id) as ServiceRecord;
}

/** A service record entered by mistake is archived, and the counters fall back to the one before. */
export async function archiveService(actor: Actor, engineId: number, serviceId: number): Promise<ServiceRecord> {
  const organisationId = actor.membership.organisationId;
  await db().transaction(async (trx) => {
    const row = await trx("services").where({ organisation_id: organisationId, engine_id: engineId, id: serviceId }).forUpdate().first();
    if (!row) throw notFound("No service record with that id on this engine.");
    if (row.archived_at) return;
    await trx("services").where({ id: serviceId }).update({ archived_at: actor.now, updated_at: trx.fn.now() });
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: "service.archived",
      entity: "service",
      entityId: serviceId,
      details: { engineId, kind: row.kind },
    });
  });
  const all = await listServiceRecords(organisationId, engineId, true);
  return all.find((s) => s.id === serviceId) as ServiceRecord;
}
