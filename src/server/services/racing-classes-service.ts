import { db } from "../../db/client.ts";
import { findRacingClass, listRacingClassRows, toRacingClass } from "../../db/racing-classes-repo.ts";
import { isDuplicateKey, roundOrNull } from "../../db/row-values.ts";
import type { RacingClass } from "../../lib/motors/types.ts";
import type { RacingClassCreate, RacingClassUpdate } from "../../lib/schemas/motors.ts";
import { conflict, notFound } from "../errors.ts";
import { writeAudit } from "./audit.ts";
import { describeChanges, type Actor } from "./motors-common.ts";

const NO_CLASS = "No racing class with that id in this organisation.";

const COLUMNS: Record<string, [string, number | null]> = {
  name: ["name", null],
  minSquishMm: ["min_squish_mm", 2],
  minChamberCc: ["min_chamber_cc", 2],
  minFlatPlateCc: ["min_flat_plate_cc", 2],
  maxDisplacementCc: ["max_displacement_cc", 1],
  squishWireNote: ["squish_wire_note", null],
  notes: ["notes", null],
};

function toColumns(input: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [field, [column, scale]] of Object.entries(COLUMNS)) {
    const v = input[field];
    if (v === undefined) continue;
    out[column] = scale !== null && typeof v === "number" ? roundOrNull(v, scale) : v;
  }
  return out;
}

function duplicateName(err: unknown): never {
  if (isDuplicateKey(err)) throw conflict("Another class has this name.", { name: "Another class has this name." });
  throw err;
}

export async function listRacingClasses(organisationId: number, includeArchived: boolean): Promise<RacingClass[]> {
  return (await listRacingClassRows(organisationId, includeArchived)).map(toRacingClass);
}

export async function getRacingClass(organisationId: number, id: number): Promise<RacingClass> {
  const row = await findRacingClass(organisationId, id);
  if (!row) throw notFound(NO_CLASS);
  return toRacingClass(row);
}

export async function createRacingClass(actor: Actor, input: RacingClassCreate): Promise<RacingClass> {
  const organisationId = actor.membership.organisationId;
  const id = await db()
    .transaction(async (trx) => {
      const [newId] = await trx("racing_classes").insert({ organisation_id: organisationId, ...toColumns(input) });
      await writeAudit(trx, {
        organisationId,
        actorUserId: actor.userId,
        action: "racing_class.created",
        entity: "racing_class",
        entityId: newId,
        details: { name: input.name },
      });
      return Number(newId);
    })
    .catch(duplicateName);
  return getRacingClass(organisationId, id);
}

export async function updateRacingClass(actor: Actor, id: number, input: RacingClassUpdate): Promise<RacingClass> {
  const organisationId = actor.membership.organisationId;
  const { archived, ...fields } = input;
  await db()
    .transaction(async (trx) => {
      const row = await findRacingClass(organisationId, id, trx);
      if (!row) throw notFound(NO_CLASS);
      const before = toRacingClass(row);
      const changes = describeChanges(before as unknown as Record<string, unknown>, fields as Record<string, unknown>);
      const columns = toColumns(fields);
      if (archived !== undefined && archived !== (row.archived_at !== null)) {
        changes.archived = { from: row.archived_at !== null, to: archived };
        columns.archived_at = archived ? actor.now : null;
      }
      if (Object.keys(changes).length === 0) return;
      await trx("racing_classes")
        .where({ id })
        .update({ ...columns, updated_at: trx.fn.now() });
      await writeAudit(trx, {
        organisationId,
        actorUserId: actor.userId,
        action: "racing_class.updated",
        entity: "racing_class",
        entityId: id,
        details: changes,
      });
    })
    .catch(duplicateName);
  return getRacingClass(organisationId, id);
}
