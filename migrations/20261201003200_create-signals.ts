import type { Knex } from "knex";

/**
 * Signals raised by the check. A condition is identified by its key; while a signal with that key
 * is not resolved, the generated `open_key` holds the key and its unique index refuses a second
 * one, even when two runners insert at once.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("signals", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.bigInteger("engine_id").unsigned().notNullable().references("id").inTable("engines").onDelete("CASCADE");
    t.string("signal_key", 160).notNullable();
    t.string("kind", 24).notNullable();
    t.enu("severity", ["watch", "act"]).notNullable();
    t.integer("cylinder").nullable();
    t.string("metric", 40).nullable();
    t.json("numbers").notNullable();
    t.text("message").notNullable();
    t.enu("state", ["open", "acknowledged", "resolved"]).notNullable().defaultTo("open");
    t.datetime("opened_at", { precision: 3 }).notNullable();
    t.datetime("escalated_at", { precision: 3 }).nullable();
    t.string("acknowledged_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.datetime("acknowledged_at", { precision: 3 }).nullable();
    t.string("resolved_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.datetime("resolved_at", { precision: 3 }).nullable();
    t.text("resolution_note").nullable();
    t.timestamps(true, true);
    t.index(["organisation_id", "state", "severity"]);
    t.index(["engine_id", "state"]);
  });
  await knex.raw(
    "ALTER TABLE signals ADD COLUMN open_key VARCHAR(160) AS (IF(state <> 'resolved', signal_key, NULL)) PERSISTENT, ADD UNIQUE INDEX signals_open_key_unique (organisation_id, open_key)",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("signals");
}
