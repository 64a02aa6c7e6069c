import type { Knex } from "knex";
import { db } from "./client.ts";
import { toNumber } from "./row-values.ts";

// Usage counters, summed in SQL from usage_entries. A service (top end, bottom end, inspection)
// or a part move on day D is taken as the last thing done that day: usage dated D counts before
// it, usage dated after D counts after it (docs/decisions/040-usage-counted-by-day.md).

export interface EngineCounterRow {
  engineId: number;
  sinceNew: number;
  sinceTopEnd: number;
  sinceBottomEnd: number;
  sinceInspection: number;
  lastTopEndOn: string | null;
  lastBottomEndOn: string | null;
  lastInspectionOn: string | null;
}

/** The latest service of each kind per engine of one organisation, as a derived table. */
export function latestServicesSql(): string {
  return `SELECT engine_id,
      MAX(CASE WHEN kind = 'top_end' THEN done_on END) AS top_on,
      MAX(CASE WHEN kind = 'bottom_end' THEN done_on END) AS bottom_on,
      MAX(CASE WHEN kind = 'inspection' THEN done_on END) AS insp_on
    FROM services WHERE organisation_id = ? AND archived_at IS NULL GROUP BY engine_id`;
}

/**
 * The counters of every engine of an organisation as a derived table (engine_id, since_*,
 * *_on). Bindings: [organisationId, organisationId].
 */
export function engineCountersSql(): string {
  return `SELECT e.id AS engine_id,
      COALESCE(SUM(u.amount), 0) AS since_new,
      COALESCE(SUM(CASE WHEN sv.top_on IS NULL OR u.occurred_on > sv.top_on THEN u.amount END), 0) AS since_top_end,
      COALESCE(SUM(CASE WHEN sv.bottom_on IS NULL OR u.occurred_on > sv.bottom_on THEN u.amount END), 0) AS since_bottom_end,
      COALESCE(SUM(CASE WHEN sv.insp_on IS NULL OR u.occurred_on > sv.insp_on THEN u.amount END), 0) AS since_inspection,
      MAX(sv.top_on) AS top_on, MAX(sv.bottom_on) AS bottom_on, MAX(sv.insp_on) AS insp_on
    FROM engines e
    LEFT JOIN (${latestServicesSql()}) sv ON sv.engine_id = e.id
    LEFT JOIN usage_entries u ON u.engine_id = e.id AND u.archived_at IS NULL
    WHERE e.organisation_id = ?`;
}

function toCounterRow(r: Record<string, unknown>): EngineCounterRow {
  return {
    engineId: Number(r.engine_id),
    sinceNew: toNumber(r.since_new),
    sinceTopEnd: toNumber(r.since_top_end),
    sinceBottomEnd: toNumber(r.since_bottom_end),
    sinceInspection: toNumber(r.since_inspection),
    lastTopEndOn: (r.top_on as string | null) ?? null,
    lastBottomEndOn: (r.bottom_on as string | null) ?? null,
    lastInspectionOn: (r.insp_on as string | null) ?? null,
  };
}

export function mapCounterRow(r: Record<string, unknown>): EngineCounterRow {
  return toCounterRow(r);
}

/**
 * Counters of the given engines (one organisation), from engine_counters, which triggers keep
 * (migrations/20261201002600). Engines without usage or services have no row: zero.
 */
export async function loadEngineCounters(organisationId: number, engineIds: number[], k: Knex = db()): Promise<Map<number, EngineCounterRow>> {
  if (engineIds.length === 0) return new Map();
  const rows: Record<string, unknown>[] = await k("engine_counters").where({ organisation_id: organisationId }).whereIn("engine_id", engineIds);
  return new Map(rows.map((r) => [Number(r.engine_id), toCounterRow(r)]));
}

/** The same counters summed from usage_entries directly: the reference the cache is checked against. */
export async function sumEngineCountersLive(organisationId: number, engineIds: number[], k: Knex = db()): Promise<Map<number, EngineCounterRow>> {
  if (engineIds.length === 0) return new Map();
  const [rows] = (await k.raw(`${engineCountersSql()} AND e.id IN (?) GROUP BY e.id`, [organisationId, organisationId, engineIds])) as [
    Record<string, unknown>[],
  ];
  return new Map(rows.map((r) => [Number(r.engine_id), toCounterRow(r)]));
}

export interface PartCounterRow {
  partId: number;
  inStints: number;
  inCurrentEngine: number | null;
  sinceTopEnd: number | null;
  sinceBottomEnd: number | null;
}

/**
 * Usage each part has seen in the engines it was in. A move into an engine on day D starts a
 * stint with the usage dated after D; the next move on day E ends it with the usage dated up to E.
 */
export async function loadPartCounters(organisationId: number, partIds: number[], k: Knex = db()): Promise<Map<number, PartCounterRow>> {
  if (partIds.length === 0) return new Map();
  const sql = `WITH moves AS (
      SELECT pm.part_id, pm.to_engine_id AS engine_id, pm.moved_on AS start_on,
        LEAD(pm.moved_on) OVER (PARTITION BY pm.part_id ORDER BY pm.moved_on, pm.id) AS end_on
      FROM part_moves pm WHERE pm.organisation_id = ? AND pm.part_id IN (?)
    )
    SELECT s.part_id,
      MAX(s.end_on IS NULL) AS installed,
      COALESCE(SUM(u.amount), 0) AS in_stints,
      COALESCE(SUM(CASE WHEN s.end_on IS NULL THEN u.amount END), 0) AS in_current,
      COALESCE(SUM(CASE WHEN s.end_on IS NULL AND (sv.top_on IS NULL OR u.occurred_on > sv.top_on) THEN u.amount END), 0) AS since_top_end,
      COALESCE(SUM(CASE WHEN s.end_on IS NULL AND (sv.bottom_on IS NULL OR u.occurred_on > sv.bottom_on) THEN u.amount END), 0) AS since_bottom_end
    FROM moves s
    LEFT JOIN (${latestServicesSql()}) sv ON sv.engine_id = s.engine_id
    LEFT JOIN usage_entries u ON u.engine_id = s.engine_id AND u.archived_at IS NULL
      AND u.occurred_on > s.start_on AND (s.end_on IS NULL OR u.occurred_on <= s.end_on)
    WHERE s.engine_id IS NOT NULL
    GROUP BY s.part_id`;
  const [rows] = (await k.raw(sql, [organisationId, partIds, organisationId])) as [Record<string, unknown>[]];
  const out = new Map<number, PartCounterRow>();
  for (const r of rows) {
    const installed = Number(r.installed) === 1;
    out.set(Number(r.part_id), {
      partId: Number(r.part_id),
      inStints: toNumber(r.in_stints),
      inCurrentEngine: installed ? toNumber(r.in_current) : null,
      sinceTopEnd: installed ? toNumber(r.since_top_end) : null,
      sinceBottomEnd: installed ? toNumber(r.since_bottom_end) : null,
    });
  }
  return out;
}
