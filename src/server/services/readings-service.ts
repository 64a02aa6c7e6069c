import { requestSignalCheck } from "../signals/request.ts";
import type { Knex } from "knex";
import { db } from "../../db/client.ts";
import { findEngineRow, findEngineRowsByIds, toEngine } from "../../db/engines-repo.ts";
import { findRacingClassesByIds, toClassRules } from "../../db/racing-classes-repo.ts";
import { findReadingSetRow, listCylinderReadings, listReadingSetRows, type ReadingSetRow } from "../../db/reading-sets-repo.ts";
import { listServiceRecords } from "../../db/service-records-repo.ts";
import { listEngineUsageDays } from "../../db/usage-repo.ts";
import { listUploadRows, toUpload } from "../../db/uploads-repo.ts";
import { roundTo, roundOrNull, toIso } from "../../db/row-values.ts";
import { computeSetFigures, type FigureCylinder, type SetFigures } from "../../lib/motors/reading-figures.ts";
import type { CylinderReading, Engine, LatestReadingSummary, ReadingSet, ServiceRecord } from "../../lib/motors/types.ts";
import type { ReadingSetCreate, ReadingSetListQuery } from "../../lib/schemas/motors.ts";
import { badRequest, conflict, forbidden, notFound } from "../errors.ts";
import { writeAudit } from "./audit.ts";
import { loadOrgSettings, pageOf, requireNotAfterToday, roundUsage, type Actor, type OrgMotorSettings } from "./motors-common.ts";

const NO_SET = "No reading set with that id in this organisation.";

function toFigureCylinder(c: CylinderReading): FigureCylinder {
  return { ...c };
}

async function figuresFor(
  engine: Engine,
  cylinders: CylinderReading[],
  elevationM: number,
  settings: OrgMotorSettings,
  k: Knex,
): Promise<SetFigures> {
  const classes = await findRacingClassesByIds(engine.racingClassId ? [engine.racingClassId] : [], k);
  const cls = engine.racingClassId ? classes.get(engine.racingClassId) : undefined;
  return computeSetFigures(engine, cylinders.map(toFigureCylinder), {
    toleranceCc: settings.chamberToleranceCc,
    elevationM,
    referenceElevationM: settings.shopElevationM,
    rules: cls && !cls.archivedAt ? toClassRules(cls) : null,
  });
}

/** Usage since new / top end / bottom end at the end of `day`; a teardown is read before that day's rebuild. */
function usageAt(
  day: string,
  beforeRebuild: boolean,
  usage: { on: string; amount: number }[],
  services: ServiceRecord[],
): ReadingSet["usageAtReading"] {
  const lastOf = (kind: string): string | null =>
    services
      .filter((s) => s.kind === kind && (beforeRebuild ? s.doneOn < day : s.doneOn <= day))
      .reduce<string | null>((m, s) => (m === null || s.doneOn > m ? s.doneOn : m), null);
  const since = (from: string | null): number =>
    roundUsage(usage.filter((u) => u.on <= day && (from === null || u.on > from)).reduce((sum, u) => sum + u.amount, 0));
  return { sinceNew: since(null), sinceTopEnd: since(lastOf("top_end")), sinceBottomEnd: since(lastOf("bottom_end")) };
}

/** Reading sets with their cylinders, figures, uploads and the engine's usage at each. */
export async function assembleReadingSets(
  organisationId: number,
  rows: ReadingSetRow[],
  k: Knex = db(),
  opts: { withUploads?: boolean; withUsage?: boolean } = {},
): Promise<ReadingSet[]> {
  if (rows.length === 0) return [];
  const settings = await loadOrgSettings(organisationId, k);
  const engineIds = [...new Set(rows.map((r) => Number(r.engine_id)))];
  const engines = new Map((await findEngineRowsByIds(organisationId, engineIds, k)).map((e) => [Number(e.id), toEngine(e)]));
  const classes = await findRacingClassesByIds(
    [...engines.values()].flatMap((e) => (e.racingClassId ? [e.racingClassId] : [])),
    k,
  );
  const setIds = rows.map((r) => Number(r.id));
  const cylinders = await listCylinderReadings(setIds, k);
  const uploads = opts.withUploads ? await listUploadRows(organisationId, { readingSetIds: setIds }, k) : [];
  const history = new Map<number, { usage: { on: string; amount: number }[]; services: ServiceRecord[] }>();
  if (opts.withUsage) {
    for (const id of engineIds) {
      history.set(id, { usage: await listEngineUsageDays(id, k), services: await listServiceRecords(organisationId, id, false, k) });
    }
  }
  return rows.map((r) => {
    const engine = engines.get(Number(r.engine_id)) as Engine;
    const cls = engine.racingClassId ? classes.get(engine.racingClassId) : undefined;
    const cyl = cylinders.get(Number(r.id)) ?? [];
    const h = history.get(engine.id);
    return {
      id: Number(r.id),
      engineId: engine.id,
      engineName: engine.name,
      takenOn: r.taken_on,
      takenBy: r.taken_by ? { id: r.taken_by, name: r.user_name ?? "" } : null,
      elevationM: Number(r.elevation_m),
      airTempC: r.air_temp_c === null ? null : Number(r.air_temp_c),
      methodNotes: r.method_notes,
      isBaseline: Boolean(r.is_baseline),
      setKind: r.set_kind,
      archivedAt: toIso(r.archived_at),
      createdAt: toIso(r.created_at) ?? "",
      usageAtReading: h
        ? usageAt(r.taken_on, r.set_kind === "teardown", h.usage, h.services)
        : { sinceNew: 0, sinceTopEnd: 0, sinceBottomEnd: 0 },
      cylinders: cyl,
      figures: computeSetFigures(engine, cyl.map(toFigureCylinder), {
        toleranceCc: settings.chamberToleranceCc,
        elevationM: Number(r.elevation_m),
        referenceElevationM: settings.shopElevationM,
        rules: cls && !cls.archivedAt ? toClassRules(cls) : null,
      }),
      uploads: uploads.filter((u) => Number(u.reading_set_id) === Number(r.id)).map(toUpload),
    };
  });
}

/** The short form the roster shows: highest ratio, lowest squish, spread, compliance. */
export function summarizeReadingSet(set: ReadingSet): LatestReadingSummary {
  const f = set.figures.cylinders;
  const max = (vals: (number | null)[]): number | null => {
    const v = vals.filter((x): x is number => x !== null);
    return v.length ? Math.max(...v) : null;
  };
  const squish = f.map((c) => c.squishMeanMm).filter((x): x is number => x !== null);
  return {
    readingSetId: set.id,
    takenOn: set.takenOn,
    setKind: set.setKind,
    isBaseline: set.isBaseline,
    maxGeometricRatio: max(f.map((c) => c.geometricRatio)),
    maxTrappedRatio: max(f.map((c) => c.trappedRatio)),
    minSquishMeanMm: squish.length ? Math.min(...squish) : null,
    chamberSpreadCc: set.figures.chamberSpread ? roundTo(set.figures.chamberSpread.spread, 3) : null,
    unconfirmedCylinders: f.filter((c) => c.chamber.status === "unconfirmed").map((c) => c.cylinderNo),
    compliant: set.figures.compliance ? set.figures.compliance.compliant : null,
  };
}

async function requireEngine(organisationId: number, engineId: number, k: Knex): Promise<Engine> {
  const row = await findEngineRow(organisationId, engineId, k);
  if (!row) throw badRequest("No engine with that id in this organisation.", { engineId: "No engine with that id in this organisation." });
  return toEngine(row);
}

function checkCylinders(engine: Engine, input: ReadingSetCreate): void {
  const fields: Record<string, string> = {};
  input.cylinders.forEach((c, i) => {
    if (c.cylinderNo > engine.cylinders)
      fields[`cylinders.${i}.cylinderNo`] = `${engine.name} has ${engine.cylinders} cylinder${engine.cylinders === 1 ? "" : "s"}.`;
  });
  if (Object.keys(fields).length) throw badRequest("Some cylinders do not exist on this engine.", fields);
}

function toCylinderInputs(input: ReadingSetCreate): CylinderReading[] {
  return input.cylinders.map((c) => ({
    cylinderNo: c.cylinderNo,
    chamberReadingsCc: (c.chamberReadingsCc ?? []).map((v) => roundTo(v, 2)),
    flatPlateCc: roundOrNull(c.flatPlateCc, 2),
    squishAMm: roundOrNull(c.squishAMm, 3),
    squishBMm: roundOrNull(c.squishBMm, 3),
    crankingKpa: roundOrNull(c.crankingKpa, 1),
    leakdownPct: roundOrNull(c.leakdownPct, 1),
    notes: c.notes ?? null,
  }));
}

function resolveElevation(input: ReadingSetCreate, settings: OrgMotorSettings): number {
  const elevation = input.elevationM ?? settings.shopElevationM;
  if (elevation === null || elevation === undefined) {
    throw badRequest("Say where the set was taken.", { elevationM: "Enter the elevation where the readings were taken." });
  }
  return elevation;
}

/** Figures for a set being typed, without saving anything. */
export async function previewReadingSet(organisationId: number, input: ReadingSetCreate): Promise<SetFigures> {
  const engine = await requireEngine(organisationId, input.engineId, db());
  checkCylinders(engine, input);
  const settings = await loadOrgSettings(organisationId);
  return figuresFor(engine, toCylinderInputs(input), resolveElevation(input, settings), settings, db());
}

/** A whole set with its cylinders in one transaction: nothing is written unless everything is. */
export async function createReadingSet(actor: Actor, input: ReadingSetCreate, mayMarkBaseline: boolean): Promise<ReadingSet> {
  const organisationId = actor.membership.organisationId;
  if (input.isBaseline && !mayMarkBaseline) throw forbidden("Only a crew chief, manager or owner marks a baseline.");
  const settings = await loadOrgSettings(organisationId);
  requireNotAfterToday("takenOn", input.takenOn, actor.now, settings.timeZone);
  return db().transaction(async (trx) => {
    // First, before any insert takes a shared lock on the organisation row (src/server/signals/request.ts).
    await requestSignalCheck(trx, organisationId, actor.now);
    const engine = await requireEngine(organisationId, input.engineId, trx);
    checkCylinders(engine, input);
    const elevationM = resolveElevation(input, settings);
    const cylinders = toCylinderInputs(input);
    // Working the figures out first refuses readings the domain cannot use (a DomainInputError is a 400).
    await figuresFor(engine, cylinders, elevationM, settings, trx);
    const [setId] = await trx("reading_sets").insert({
      organisation_id: organisationId,
      engine_id: engine.id,
      taken_on: input.takenOn,
      taken_by: actor.userId,
      elevation_m: elevationM,
      air_temp_c: roundOrNull(input.airTempC, 1),
      method_notes: input.methodNotes ?? null,
      is_baseline: Boolean(input.isBaseline),
      set_kind: input.setKind,
    });
    await trx("cylinder_readings").insert(
      cylinders.map((c) => ({
        reading_set_id: setId,
        cylinder_no: c.cylinderNo,
        chamber_readings_cc: JSON.stringify(c.chamberReadingsCc),
        flat_plate_cc: c.flatPlateCc,
        squish_a_mm: c.squishAMm,
        squish_b_mm: c.squishBMm,
        cranking_kpa: c.crankingKpa,
        leakdown_pct: c.leakdownPct,
        notes: c.notes,
      })),
    );
    if (input.uploadIds?.length) {
      const attached = await trx("uploads")
        .where({ organisation_id: organisationId })
        .whereIn("id", input.uploadIds)
        .whereNull("reading_set_id")
        .whereNull("archived_at")
        .where((w) => w.whereNull("engine_id").orWhere("engine_id", engine.id))
        .update({ reading_set_id: setId, engine_id: engine.id, updated_at: trx.fn.now() });
      if (attached !== new Set(input.uploadIds).size) {
        throw badRequest("Some photos cannot be attached to this set.", {
          uploadIds: "Some of these uploads belong elsewhere or are already attached.",
        });
      }
    }
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: "reading_set.created",
      entity: "reading_set",
      entityId: setId,
      details: { engineId: engine.id, takenOn: input.takenOn, cylinders: cylinders.length, isBaseline: Boolean(input.isBaseline) },
    });
    // Read back before the commit: once committed, a lost connection must not turn a saved write into a 503.
    return getReadingSet(organisationId, Number(setId), trx);
  });
}

export async function getReadingSet(organisationId: number, id: number, k: Knex = db()): Promise<ReadingSet> {
  const row = await findReadingSetRow(organisationId, id, k);
  if (!row) throw notFound(NO_SET);
  const [set] = await assembleReadingSets(organisationId, [row], k, { withUploads: true, withUsage: true });
  return set;
}

export async function listReadingSets(
  organisationId: number,
  query: ReadingSetListQuery,
): Promise<{ readingSets: ReadingSet[]; page: number; perPage: number; total: number }> {
  const { page, perPage, offset } = pageOf(query, 50);
  const { rows, total } = await listReadingSetRows(organisationId, query, { limit: perPage, offset });
  const readingSets = await assembleReadingSets(organisationId, rows, db(), { withUploads: true, withUsage: query.engineId !== undefined });
  return { readingSets, page, perPage, total };
}

export async function setBaseline(actor: Actor, id: number, isBaseline: boolean): Promise<ReadingSet> {
  const organisationId = actor.membership.organisationId;
  return db().transaction(async (trx) => {
    // First, before any insert takes a shared lock on the organisation row (src/server/signals/request.ts).
    await requestSignalCheck(trx, organisationId, actor.now);
    const row = await findReadingSetRow(organisationId, id, trx, true);
    if (!row) throw notFound(NO_SET);
    if (row.archived_at) throw conflict("This reading set is archived.");
    if (Boolean(row.is_baseline) === isBaseline) return getReadingSet(organisationId, id, trx);
    await trx("reading_sets").where({ id }).update({ is_baseline: isBaseline, updated_at: trx.fn.now() });
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: isBaseline ? "reading_set.baseline_set" : "reading_set.baseline_cleared",
      entity: "reading_set",
      entityId: id,
      details: { engineId: Number(row.engine_id), takenOn: row.taken_on },
    });
    return getReadingSet(organisationId, id, trx);
  });
}

/** Readings are never deleted: a set entered by mistake is archived and drops out of figures and charts. */
export async function archiveReadingSet(actor: Actor, id: number, archived: boolean): Promise<ReadingSet> {
  const organisationId = actor.membership.organisationId;
  return db().transaction(async (trx) => {
    // First, before any insert takes a shared lock on the organisation row (src/server/signals/request.ts).
    await requestSignalCheck(trx, organisationId, actor.now);
    const row = await findReadingSetRow(organisationId, id, trx, true);
    if (!row) throw notFound(NO_SET);
    if ((row.archived_at !== null) === archived) return getReadingSet(organisationId, id, trx);
    await trx("reading_sets")
      .where({ id })
      .update({ archived_at: archived ? actor.now : null, updated_at: trx.fn.now() });
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: archived ? "reading_set.archived" : "reading_set.restored",
      entity: "reading_set",
      entityId: id,
      details: { engineId: Number(row.engine_id), takenOn: row.taken_on },
    });
    return getReadingSet(organisationId, id, trx);
  });
}
