import type { Knex } from "knex";

/**
 * Each engine's usage counters, kept by triggers on usage_entries and services so that every
 * writer (API, import, bench jobs, seeds) keeps them right, and the roster can sort 5,000
 * engines by a counter without summing every usage row (docs/decisions/042-counter-cache.md).
 * A usage row adds or removes its own amount; a service change recounts that one engine.
 * The rule is the one of counters-repo.ts: usage dated after a service's day counts after it.
 */

const COUNT_ENGINE = (engine: string): string => `
  INSERT INTO engine_counters (engine_id, organisation_id, since_new, since_top_end, since_bottom_end, since_inspection, top_on, bottom_on, insp_on)
  SELECT e.id, e.organisation_id,
    COALESCE(SUM(u.amount), 0),
    COALESCE(SUM(CASE WHEN sv.top_on IS NULL OR u.occurred_on > sv.top_on THEN u.amount END), 0),
    COALESCE(SUM(CASE WHEN sv.bottom_on IS NULL OR u.occurred_on > sv.bottom_on THEN u.amount END), 0),
    COALESCE(SUM(CASE WHEN sv.insp_on IS NULL OR u.occurred_on > sv.insp_on THEN u.amount END), 0),
    MAX(sv.top_on), MAX(sv.bottom_on), MAX(sv.insp_on)
  FROM engines e
  LEFT JOIN (
    SELECT engine_id,
      MAX(CASE WHEN kind = 'top_end' THEN done_on END) AS top_on,
      MAX(CASE WHEN kind = 'bottom_end' THEN done_on END) AS bottom_on,
      MAX(CASE WHEN kind = 'inspection' THEN done_on END) AS insp_on
    FROM services WHERE engine_id = ${engine} AND archived_at IS NULL GROUP BY engine_id
  ) sv ON sv.engine_id = e.id
  LEFT JOIN usage_entries u ON u.engine_id = e.id AND u.archived_at IS NULL
  WHERE e.id = ${engine}
  GROUP BY e.id, e.organisation_id
  ON DUPLICATE KEY UPDATE since_new = VALUES(since_new), since_top_end = VALUES(since_top_end),
    since_bottom_end = VALUES(since_bottom_end), since_inspection = VALUES(since_inspection),
    top_on = VALUES(top_on), bottom_on = VALUES(bottom_on), insp_on = VALUES(insp_on), updated_at = CURRENT_TIMESTAMP`;

/** Adds (sign 1) or takes away (sign -1) one usage row's amount. */
const APPLY_ROW = (row: "NEW" | "OLD", sign: 1 | -1): string => `
  UPDATE engine_counters SET
    since_new = since_new + ${sign} * ${row}.amount,
    since_top_end = since_top_end + ${sign} * IF(top_on IS NULL OR ${row}.occurred_on > top_on, ${row}.amount, 0),
    since_bottom_end = since_bottom_end + ${sign} * IF(bottom_on IS NULL OR ${row}.occurred_on > bottom_on, ${row}.amount, 0),
    since_inspection = since_inspection + ${sign} * IF(insp_on IS NULL OR ${row}.occurred_on > insp_on, ${row}.amount, 0),
    updated_at = CURRENT_TIMESTAMP
  WHERE engine_id = ${row}.engine_id`;

const TRIGGERS: [string, string][] = [
  [
    "usage_entries_count_insert",
    `AFTER INSERT ON usage_entries FOR EACH ROW BEGIN
      IF NOT EXISTS (SELECT 1 FROM engine_counters WHERE engine_id = NEW.engine_id) THEN ${COUNT_ENGINE("NEW.engine_id")};
      ELSEIF NEW.archived_at IS NULL THEN ${APPLY_ROW("NEW", 1)};
      END IF;
    END`,
  ],
  [
    "usage_entries_count_update",
    `AFTER UPDATE ON usage_entries FOR EACH ROW BEGIN
      IF OLD.archived_at IS NULL THEN ${APPLY_ROW("OLD", -1)}; END IF;
      IF NOT EXISTS (SELECT 1 FROM engine_counters WHERE engine_id = NEW.engine_id) THEN ${COUNT_ENGINE("NEW.engine_id")};
      ELSEIF NEW.archived_at IS NULL THEN ${APPLY_ROW("NEW", 1)};
      END IF;
    END`,
  ],
  [
    "usage_entries_count_delete",
    `AFTER DELETE ON usage_entries FOR EACH ROW BEGIN
      IF OLD.archived_at IS NULL THEN ${APPLY_ROW("OLD", -1)}; END IF;
    END`,
  ],
  ["services_count_insert", `AFTER INSERT ON services FOR EACH ROW BEGIN ${COUNT_ENGINE("NEW.engine_id")}; END`],
  [
    "services_count_update",
    `AFTER UPDATE ON services FOR EACH ROW BEGIN
      ${COUNT_ENGINE("NEW.engine_id")};
      IF OLD.engine_id <> NEW.engine_id THEN ${COUNT_ENGINE("OLD.engine_id")}; END IF;
    END`,
  ],
  ["services_count_delete", `AFTER DELETE ON services FOR EACH ROW BEGIN ${COUNT_ENGINE("OLD.engine_id")}; END`],
];

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("engine_counters", (t) => {
    t.bigInteger("engine_id").unsigned().primary().references("id").inTable("engines").onDelete("CASCADE");
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.decimal("since_new", 14, 2).notNullable().defaultTo(0);
    t.decimal("since_top_end", 14, 2).notNullable().defaultTo(0);
    t.decimal("since_bottom_end", 14, 2).notNullable().defaultTo(0);
    t.decimal("since_inspection", 14, 2).notNullable().defaultTo(0);
    t.date("top_on").nullable();
    t.date("bottom_on").nullable();
    t.date("insp_on").nullable();
    t.timestamps(true, true);
    t.index(["organisation_id", "since_top_end"]);
    t.index(["organisation_id", "since_bottom_end"]);
  });
  for (const [name, body] of TRIGGERS) await knex.raw(`CREATE TRIGGER ${name} ${body}`);
  // Engines that already have usage or services (none on a fresh install) are counted once here.
  await knex.raw(`INSERT INTO engine_counters (engine_id, organisation_id) SELECT id, organisation_id FROM engines`);
  const ids: { id: number }[] = await knex("engines").select("id");
  for (const { id } of ids) await knex.raw(COUNT_ENGINE(String(Number(id))));
}

export async function down(knex: Knex): Promise<void> {
  for (const [name] of TRIGGERS) await knex.raw(`DROP TRIGGER IF EXISTS ${name}`);
  await knex.schema.dropTableIfExists("engine_counters");
}
