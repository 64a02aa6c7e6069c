import type { Knex } from "knex";
import { db } from "../../db/client.ts";
import { loadPartCounters } from "../../db/counters-repo.ts";
import { findEngineRow } from "../../db/engines-repo.ts";
import { findLatestMoveOn, findPartRow, listPartEvents, listPartMoves, listPartRows, type PartRow } from "../../db/parts-repo.ts";
import { isDuplicateKey, roundTo, toIso, toNumber, toNumberOrNull } from "../../db/row-values.ts";
import type { Part, PartEvent, PartMove, UsageUnit } from "../../lib/motors/types.ts";
import type { PartCreate, PartEventInput, PartListQuery, PartMoveInput, PartUpdate } from "../../lib/schemas/motors.ts";
import { badRequest, conflict, notFound } from "../errors.ts";
import { writeAudit } from "./audit.ts";
import {
  dayIn,
  describeChanges,
  loadOrgSettings,
  pageOf,
  requireNotAfterToday,
  roundUsage,
  toIntervalCounter,
  type Actor,
} from "./motors-common.ts";

const NO_PART = "No part with that id in this organisation.";
/** Kinds that are machined by cutting their face, and kinds that are bored oversize. */
const CUT_KINDS = new Set(["head", "insert", "cylinder"]);
const OVERSIZE_KINDS = new Set(["piston", "rings", "cylinder"]);
/** A part's own usage limit is planned with the organisation's usual fraction (TRADE.md: 80 %). */
const PART_PLAN_FRACTION = 0.8;

async function toParts(organisationId: number, rows: PartRow[], unit: UsageUnit, k: Knex): Promise<Part[]> {
  const counters = await loadPartCounters(
    organisationId,
    rows.map((r) => Number(r.id)),
    k,
  );
  return rows.map((r) => {
    const c = counters.get(Number(r.id));
    const initial = toNumber(r.initial_usage);
    const sinceNew = roundUsage(initial + (c?.inStints ?? 0));
    const usageLimit = toNumberOrNull(r.usage_limit);
    return {
      id: Number(r.id),
      serial: r.serial,
      kind: r.kind,
      description: r.description,
      engineId: r.engine_id === null ? null : Number(r.engine_id),
      engineName: r.engine_name ?? null,
      cylinderNo: r.cylinder_no === null ? null : Number(r.cylinder_no),
      usageLimit,
      initialUsage: initial,
      maxTotalCutMm: toNumberOrNull(r.max_total_cut_mm),
      maxOversizeMm: toNumberOrNull(r.max_oversize_mm),
      totalCutMm: toNumber(r.total_cut_mm),
      oversizeMm: toNumber(r.oversize_mm),
      notes: r.notes,
      archivedAt: toIso(r.archived_at),
      counters: {
        unit,
        sinceNew,
        inCurrentEngine: r.engine_id === null ? null : roundUsage(c?.inCurrentEngine ?? 0),
        sinceTopEnd: r.engine_id === null ? null : roundUsage(c?.sinceTopEnd ?? 0),
        sinceBottomEnd: r.engine_id === null ? null : roundUsage(c?.sinceBottomEnd ?? 0),
        life: toIntervalCounter(sinceNew, usageLimit, PART_PLAN_FRACTION, null),
      },
    };
  });
}

export async function listParts(
  organisationId: number,
  q: PartListQuery,
): Promise<{ parts: Part[]; page: number; perPage: number; total: number }> {
  const { page, perPage, offset } = pageOf(q, 100);
  const settings = await loadOrgSettings(organisationId);
  const { rows, total } = await listPartRows(organisationId, q, { limit: perPage, offset });
  return { parts: await toParts(organisationId, rows, settings.usageUnit, db()), page, perPage, total };
}

export async function listPartsOfEngine(organisationId: number, engineId: number): Promise<Part[]> {
  const settings = await loadOrgSettings(organisationId);
  const { rows } = await listPartRows(organisationId, { engineId }, { limit: 1000, offset: 0 });
  return toParts(organisationId, rows, settings.usageUnit, db());
}

export async function getPart(organisationId: number, id: number): Promise<{ part: Part; moves: PartMove[]; events: PartEvent[] }> {
  const row = await findPartRow(organisationId, id);
  if (!row) throw notFound(NO_PART);
  const settings = await loadOrgSettings(organisationId);
  const [part] = await toParts(organisationId, [row], settings.usageUnit, db());
  const moves = (await listPartMoves(organisationId, { partId: id })).map(({ serial: _s, partKind: _k, ...m }) => m);
  const events = (await listPartEvents(organisationId, { partId: id })).map(({ serial: _s, partKind: _k, ...e }) => e);
  return { part, moves, events };
}

/** A target engine named in a body: this organisation's, live, with that cylinder. */
async function requireTargetEngine(
  organisationId: number,
  engineId: number,
  cylinderNo: number | null | undefined,
  k: Knex,
  field = "engineId",
) {
  const engine = await findEngineRow(organisationId, engineId, k, { forUpdate: true });
  if (!engine)
    throw badRequest("No engine with that id in this organisation.", { [field]: "No engine with that id in this organisation." });
  if (engine.archived_at || engine.status === "retired")
    throw conflict(`${engine.name} is retired or archived.`, { [field]: "retired or archived" });
  if (cylinderNo != null && cylinderNo > Number(engine.cylinders)) {
    throw badRequest("That cylinder does not exist on this engine.", { cylinderNo: `${engine.name} has ${engine.cylinders} cylinders.` });
  }
  return engine;
}

function duplicateSerial(err: unknown): never {
  if (isDuplicateKey(err)) throw conflict("A part of this kind with this serial exists already.", { serial: "already used for this kind" });
  throw err;
}

export async function createPart(actor: Actor, input: PartCreate): Promise<Part> {
  const organisationId = actor.membership.organisationId;
  const settings = await loadOrgSettings(organisationId);
  const installedOn = input.installedOn ?? dayIn(actor.now, settings.timeZone);
  requireNotAfterToday("installedOn", installedOn, actor.now, settings.timeZone);
  const id = await db()
    .transaction(async (trx) => {
      if (input.engineId != null) await requireTargetEngine(organisationId, input.engineId, input.cylinderNo, trx);
      const [partId] = await trx("parts").insert({
        organisation_id: organisationId,
        serial: input.serial,
        kind: input.kind,
        description: input.description ?? null,
        engine_id: input.engineId ?? null,
        cylinder_no: input.engineId != null ? (input.cylinderNo ?? null) : null,
        usage_limit: input.usageLimit ?? null,
        initial_usage: roundTo(input.initialUsage ?? 0, 2),
        max_total_cut_mm: input.maxTotalCutMm ?? null,
        max_oversize_mm: input.maxOversizeMm ?? null,
        notes: input.notes ?? null,
      });
      if (input.engineId != null) {
        await trx("part_moves").insert({
          organisation_id: organisationId,
          part_id: partId,
          from_engine_id: null,
          to_engine_id: input.engineId,
          to_cylinder_no: input.cylinderNo ?? null,
          moved_on: installedOn,
          moved_by: actor.userId,
        });
      }
      await writeAudit(trx, {
        organisationId,
        actorUserId: actor.userId,
        action: "part.created",
        entity: "part",
        entityId: partId,
        details: { serial: input.serial, kind: input.kind, engineId: input.engineId ?? null },
      });
      return Number(partId);
    })
    .catch(duplicateSerial);
  return (await getPart(organisationId, id)).part;
}

export async function updatePart(actor: Actor, id: number, input: PartUpdate): Promise<Part> {
  const organisationId = actor.membership.organisationId;
  const { archived, ...fields } = input;
  await db()
    .transaction(async (trx) => {
      const row = await findPartRow(organisationId, id, trx, true);
      if (!row) throw notFound(NO_PART);
      if (archived === true && row.engine_id !== null) {
        throw conflict(`This part is in ${row.engine_name}: move it to the shelf first.`, { archived: "installed in an engine" });
      }
      const columns: Record<string, unknown> = {};
      if (fields.serial !== undefined) columns.serial = fields.serial;
      if (fields.description !== undefined) columns.description = fields.description;
      if (fields.usageLimit !== undefined) columns.usage_limit = fields.usageLimit;
      if (fields.maxTotalCutMm !== undefined) columns.max_total_cut_mm = fields.maxTotalCutMm;
      if (fields.maxOversizeMm !== undefined) columns.max_oversize_mm = fields.maxOversizeMm;
      if (fields.notes !== undefined) columns.notes = fields.notes;
      if (archived !== undefined) columns.archived_at = archived ? (row.archived_at ?? actor.now) : null;
      const before = {
        serial: row.serial,
        description: row.description,
        usageLimit: toNumberOrNull(row.usage_limit),
        maxTotalCutMm: toNumberOrNull(row.max_total_cut_mm),
        maxOversizeMm: toNumberOrNull(row.max_oversize_mm),
        notes: row.notes,
      };
      const changes = describeChanges(before, fields as Record<string, unknown>);
      if (archived !== undefined && archived !== (row.archived_at !== null))
        changes.archived = { from: row.archived_at !== null, to: archived };
      if (Object.keys(changes).length === 0) return;
      await trx("parts")
        .where({ id })
        .update({ ...columns, updated_at: trx.fn.now() });
      await writeAudit(trx, {
        organisationId,
        actorUserId: actor.userId,
        action: "part.updated",
        entity: "part",
        entityId: id,
        details: changes,
      });
    })
    .catch(duplicateSerial);
  return (await getPart(organisationId, id)).part;
}

/** Moves a part into another engine (or to the shelf with toEngineId null); its history moves with it. */
export async function movePart(actor: Actor, id: number, input: PartMoveInput): Promise<Part> {
  const organisationId = actor.membership.organisationId;
  const settings = await loadOrgSettings(organisationId);
  requireNotAfterToday("movedOn", input.movedOn, actor.now, settings.timeZone);
  await db().transaction(async (trx) => {
    const row = await findPartRow(organisationId, id, trx, true);
    if (!row) throw notFound(NO_PART);
    if (row.archived_at) throw conflict("This part is archived.");
    const from = row.engine_id === null ? null : Number(row.engine_id);
    if (from === input.toEngineId && (input.cylinderNo ?? null) === (row.cylinder_no === null ? null : Number(row.cylinder_no))) {
      throw conflict("The part is there already.", { toEngineId: "already there" });
    }
    if (input.toEngineId !== null) await requireTargetEngine(organisationId, input.toEngineId, input.cylinderNo, trx, "toEngineId");
    const latest = await findLatestMoveOn(id, trx);
    if (latest && input.movedOn < latest) {
      throw badRequest("The part moved later than that already.", { movedOn: `The part's last move was on ${latest}.` });
    }
    await trx("part_moves").insert({
      organisation_id: organisationId,
      part_id: id,
      from_engine_id: from,
      to_engine_id: input.toEngineId,
      to_cylinder_no: input.toEngineId === null ? null : (input.cylinderNo ?? null),
      moved_on: input.movedOn,
      moved_by: actor.userId,
      notes: input.notes ?? null,
    });
    await trx("parts")
      .where({ id })
      .update({
        engine_id: input.toEngineId,
        cylinder_no: input.toEngineId === null ? null : (input.cylinderNo ?? null),
        updated_at: trx.fn.now(),
      });
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: "part.moved",
      entity: "part",
      entityId: id,
      details: { fromEngineId: from, toEngineId: input.toEngineId, movedOn: input.movedOn },
    });
  });
  return (await getPart(organisationId, id)).part;
}

/**
 * Records machining that was done: a cut adds to the part's total material removed; an oversize
 * states the new oversize. Past the part's own limit it is still recorded (it happened) and flagged.
 */
export async function recordPartEvent(
  actor: Actor,
  id: number,
  input: PartEventInput,
): Promise<{ part: Part; event: PartEvent; overLimit: boolean }> {
  const organisationId = actor.membership.organisationId;
  const settings = await loadOrgSettings(organisationId);
  requireNotAfterToday("doneOn", input.doneOn, actor.now, settings.timeZone);
  const result = await db().transaction(async (trx) => {
    const row = await findPartRow(organisationId, id, trx, true);
    if (!row) throw notFound(NO_PART);
    if (row.archived_at) throw conflict("This part is archived.");
    const amount = roundTo(input.amountMm, 3);
    let totalAfter: number;
    let limit: number | null;
    if (input.kind === "cut") {
      if (!CUT_KINDS.has(row.kind)) throw badRequest("Only heads, inserts and cylinders are cut.", { kind: `A ${row.kind} is not cut.` });
      totalAfter = roundTo(toNumber(row.total_cut_mm) + amount, 3);
      limit = toNumberOrNull(row.max_total_cut_mm);
    } else {
      if (!OVERSIZE_KINDS.has(row.kind))
        throw badRequest("Only pistons, rings and cylinders go oversize.", { kind: `A ${row.kind} does not go oversize.` });
      if (amount <= toNumber(row.oversize_mm)) {
        throw badRequest("A rebore only goes up.", {
          amountMm: `Enter the new oversize, above the present ${toNumber(row.oversize_mm)} mm.`,
        });
      }
      totalAfter = amount;
      limit = toNumberOrNull(row.max_oversize_mm);
    }
    const [eventId] = await trx("part_events").insert({
      organisation_id: organisationId,
      part_id: id,
      engine_id: row.engine_id,
      kind: input.kind,
      amount_mm: amount,
      total_after_mm: totalAfter,
      done_on: input.doneOn,
      done_by: actor.userId,
      notes: input.notes ?? null,
    });
    await trx("parts")
      .where({ id })
      .update({ ...(input.kind === "cut" ? { total_cut_mm: totalAfter } : { oversize_mm: totalAfter }), updated_at: trx.fn.now() });
    const overLimit = limit !== null && totalAfter > limit + 1e-9;
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: input.kind === "cut" ? "part.cut" : "part.oversized",
      entity: "part",
      entityId: id,
      details: { amountMm: amount, totalAfterMm: totalAfter, overLimit },
    });
    return { eventId: Number(eventId), overLimit };
  });
  const { part, events } = await getPart(organisationId, id);
  return { part, event: events.find((e) => e.id === result.eventId) as PartEvent, overLimit: result.overLimit };
}
