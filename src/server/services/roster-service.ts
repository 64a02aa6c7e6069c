import type { Knex } from "knex";
import { db } from "../../db/client.ts";
import { mapCounterRow, type EngineCounterRow } from "../../db/counters-repo.ts";
import { listLatestSetRows } from "../../db/reading-sets-repo.ts";
import { likeTerm, toIso, toNumber, toNumberOrNull } from "../../db/row-values.ts";
import { computeDisplacementCc } from "../../lib/domain/compression.ts";
import type { EngineCounters, Roster, RosterRow, UsageUnit } from "../../lib/motors/types.ts";
import { PAGE_SIZE_DEFAULT, type EngineListQuery, type RosterSortKey } from "../../lib/schemas/motors.ts";
import { pageOf, roundUsage, toIntervalCounter } from "./motors-common.ts";
import { assembleReadingSets, summarizeReadingSet } from "./readings-service.ts";

// The Motors roster. Filters, sort and the page are chosen in SQL; the counters come from
// engine_counters (kept by triggers), so sorting 5,000 engines by usage since the last top end
// needs no sum over their usage rows (bench/roster-bench.ts and bench/load-bench.ts measure it).

const COUNTER_SORTS: Partial<Record<RosterSortKey, string>> = {
  sinceNew: "COALESCE(ct.since_new, 0)",
  sinceTopEnd: "COALESCE(ct.since_top_end, 0)",
  sinceBottomEnd: "COALESCE(ct.since_bottom_end, 0)",
  topEndShare: "COALESCE(ct.since_top_end, 0) / e.top_end_limit",
  bottomEndShare: "COALESCE(ct.since_bottom_end, 0) / e.bottom_end_limit",
};

/**
 * Counter sorts that engine_counters' (organisation_id, <column>) indexes can serve: descending,
 * the page's smallest value is found by walking the index from the top (see findPageFloor).
 */
const INDEXED_COUNTERS: Partial<Record<RosterSortKey, string>> = {
  sinceTopEnd: "ct.since_top_end",
  sinceBottomEnd: "ct.since_bottom_end",
};

/** The joins a query needs beyond engines: each one is paid for every engine of the organisation. */
interface RosterJoins {
  counters: boolean;
  installations: boolean;
}

function sortKeyOf(sort: string | undefined): RosterSortKey {
  return ((sort?.startsWith("-") ? sort.slice(1) : sort) ?? "name") as RosterSortKey;
}

function filtered(organisationId: number, q: EngineListQuery, k: Knex, joins: RosterJoins): Knex.QueryBuilder {
  const qb = k("engines as e").where("e.organisation_id", organisationId);
  if (joins.counters) qb.leftJoin("engine_counters as ct", "ct.engine_id", "e.id");
  if (joins.installations) qb.leftJoin("installations as i", "i.open_engine_id", "e.id").leftJoin("chassis as c", "c.id", "i.chassis_id");
  if (!q.includeArchived) qb.whereNull("e.archived_at");
  if (q.status?.length) qb.whereIn("e.status", q.status);
  if (q.chassisId === "none") qb.whereNull("i.id");
  else if (q.chassisId !== undefined) qb.where("i.chassis_id", q.chassisId);
  if (q.racingClassId !== undefined) qb.where("e.racing_class_id", q.racingClassId);
  if (q.search) {
    const term = likeTerm(q.search);
    qb.where((w) => w.where("e.name", "like", term).orWhere("e.serial", "like", term));
  }
  return qb;
}

function applySort(qb: Knex.QueryBuilder, sort: string | undefined): void {
  const desc = sort?.startsWith("-") ?? false;
  const key = (desc ? sort!.slice(1) : (sort ?? "name")) as RosterSortKey;
  const dir = desc ? "DESC" : "ASC";
  const counter = COUNTER_SORTS[key];
  if (counter) {
    // Engines without a limit sort last in either direction.
    qb.orderByRaw(`(${counter}) IS NULL, ${counter} ${dir}`);
  } else if (key === "status") {
    qb.orderByRaw(`FIELD(e.status, 'running', 'bench', 'spare', 'retired') ${dir}`);
  } else if (key === "chassis") {
    qb.orderByRaw(`c.number IS NULL, LENGTH(c.number) ${dir}, c.number ${dir}`);
  } else if (key === "updatedAt") {
    qb.orderBy("e.updated_at", dir.toLowerCase());
  }
  if (key !== "name") qb.orderBy("e.name", "asc");
  else qb.orderBy("e.name", dir.toLowerCase());
  qb.orderBy("e.id", "asc");
}

/**
 * For a descending sort by an indexed counter: the counter value of the last row of the page,
 * read by walking the counter index from the top through the first offset + perPage matching
 * engines (instead of sorting every engine of the organisation). Every row of the page has at
 * least this value, so the page query may keep only such rows and still sort them by the full
 * key (ties, name, id) exactly as before. Null when the walk finds fewer rows or reaches zero:
 * engines without a counter row count as zero, and only the index-free query places them.
 */
async function findPageFloor(
  organisationId: number,
  q: EngineListQuery,
  column: string,
  last: number,
  installations: boolean,
  k: Knex,
): Promise<number | null> {
  const row = await filtered(organisationId, q, k, { counters: true, installations })
    .where("ct.organisation_id", organisationId)
    .orderBy(column, "desc")
    .offset(last)
    .first({ v: column });
  const v = row ? Number(row.v) : null;
  return v !== null && Number.isFinite(v) && v > 0 ? v : null;
}

const ROW_COLUMNS = [
  "e.id",
  "e.name",
  "e.serial",
  "e.status",
  "e.cycle",
  "e.cylinders",
  "e.bore_mm",
  "e.stroke_mm",
  "e.racing_class_id",
  "e.top_end_limit",
  "e.bottom_end_limit",
  "e.inspection_interval",
  "e.plan_fraction",
  "e.archived_at",
  "e.updated_at",
  "c.id as chassis_id",
  "c.number as chassis_number",
  "c.kind as chassis_kind",
  "c.meter_kind as chassis_meter_kind",
  "rc.name as class_name",
  "ct.since_new",
  "ct.since_top_end",
  "ct.since_bottom_end",
  "ct.since_inspection",
  "ct.top_on",
  "ct.bottom_on",
  "ct.insp_on",
];

export function toEngineCounters(
  c: EngineCounterRow | undefined,
  limits: { topEnd: number | null; bottomEnd: number | null; inspection: number | null; planFraction: number },
  unit: UsageUnit,
): EngineCounters {
  const x = c ?? {
    sinceNew: 0,
    sinceTopEnd: 0,
    sinceBottomEnd: 0,
    sinceInspection: 0,
    lastTopEndOn: null,
    lastBottomEndOn: null,
    lastInspectionOn: null,
  };
  return {
    unit,
    sinceNew: roundUsage(x.sinceNew),
    topEnd: toIntervalCounter(x.sinceTopEnd, limits.topEnd, limits.planFraction, x.lastTopEndOn),
    bottomEnd: toIntervalCounter(x.sinceBottomEnd, limits.bottomEnd, limits.planFraction, x.lastBottomEndOn),
    inspection: toIntervalCounter(x.sinceInspection, limits.inspection, limits.planFraction, x.lastInspectionOn),
  };
}

/** The ids of one page in roster order, from a query that joins only what it filters or sorts by. */
async function selectPageIds(organisationId: number, q: EngineListQuery, offset: number, perPage: number, k: Knex): Promise<number[]> {
  const key = sortKeyOf(q.sort);
  const installations = q.chassisId !== undefined || key === "chassis";
  const pageQuery = filtered(organisationId, q, k, { counters: key in COUNTER_SORTS, installations }).select("e.id");
  const indexed = q.sort?.startsWith("-") ? INDEXED_COUNTERS[key] : undefined;
  if (indexed) {
    const floor = await findPageFloor(organisationId, q, indexed, offset + perPage - 1, installations, k);
    if (floor !== null) pageQuery.where("ct.organisation_id", organisationId).where(indexed, ">=", floor);
  }
  applySort(pageQuery, q.sort);
  return (await pageQuery.limit(perPage).offset(offset)).map((r: { id: number }) => Number(r.id));
}

/** The page's rows in full, in the order of `ids`. */
async function readPageRows(organisationId: number, ids: number[], k: Knex): Promise<Record<string, any>[]> {
  if (ids.length === 0) return [];
  const rows: Record<string, any>[] = await k("engines as e")
    .leftJoin("engine_counters as ct", "ct.engine_id", "e.id")
    .leftJoin("installations as i", "i.open_engine_id", "e.id")
    .leftJoin("chassis as c", "c.id", "i.chassis_id")
    .leftJoin("racing_classes as rc", "rc.id", "e.racing_class_id")
    .where("e.organisation_id", organisationId)
    .whereIn("e.id", ids)
    .select(ROW_COLUMNS);
  const position = new Map(ids.map((id, i) => [id, i]));
  return rows.sort((a, b) => position.get(Number(a.id))! - position.get(Number(b.id))!);
}

/**
 * One page of the roster: the count and the sorted page of ids touch only the tables the filters
 * and the sort need (an engine has at most one open installation and one counter row, so a join
 * that neither filters nor sorts cannot change either), then the page's rows are read in full by
 * id. Sorting 5,000 ids is cheaper than sorting 5,000 whole joined rows to keep 50, and a
 * descending sort by an indexed counter sorts only the page's candidates (bench/load-bench.ts).
 */
export async function listRoster(organisationId: number, unit: UsageUnit, q: EngineListQuery, k: Knex = db()): Promise<Roster> {
  const { page, perPage, offset } = pageOf(q, PAGE_SIZE_DEFAULT);
  const [countRow, pageIds] = await Promise.all([
    filtered(organisationId, q, k, { counters: false, installations: q.chassisId !== undefined }).count<{ n: number }[]>({ n: "*" }).first(),
    selectPageIds(organisationId, q, offset, perPage, k),
  ]);
  const total = Number(countRow?.n ?? 0);
  const rows = await readPageRows(organisationId, pageIds, k);
  const ids = rows.map((r) => Number(r.id));
  const counters = new Map(rows.map((r) => [Number(r.id), r.since_new === null ? undefined : mapCounterRow({ ...r, engine_id: r.id })]));
  const latestRows = await listLatestSetRows(organisationId, ids, k);
  const latest = new Map((await assembleReadingSets(organisationId, latestRows, k)).map((s) => [s.engineId, summarizeReadingSet(s)]));

  const engines: RosterRow[] = rows.map((r) => {
    const id = Number(r.id);
    return {
      id,
      name: r.name,
      serial: r.serial,
      status: r.status,
      cycle: r.cycle,
      cylinders: Number(r.cylinders),
      displacementCc: Math.round(computeDisplacementCc(toNumber(r.bore_mm), toNumber(r.stroke_mm), Number(r.cylinders)) * 1e4) / 1e4,
      racingClass: r.racing_class_id ? { id: Number(r.racing_class_id), name: r.class_name ?? "" } : null,
      chassis: r.chassis_id
        ? { id: Number(r.chassis_id), number: r.chassis_number, kind: r.chassis_kind, meterKind: r.chassis_meter_kind }
        : null,
      counters: toEngineCounters(
        counters.get(id),
        {
          topEnd: toNumberOrNull(r.top_end_limit),
          bottomEnd: toNumberOrNull(r.bottom_end_limit),
          inspection: toNumberOrNull(r.inspection_interval),
          planFraction: toNumber(r.plan_fraction),
        },
        unit,
      ),
      latestReading: latest.get(id) ?? null,
      archivedAt: toIso(r.archived_at),
      updatedAt: toIso(r.updated_at) ?? "",
    };
  });
  return { engines, page, perPage, total, unit };
}
