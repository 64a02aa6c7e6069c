import type { Knex } from "knex";

/**
 * Usage per engine in the organisation's unit. import_key (unique per organisation) makes a
 * re-imported file write nothing twice. Never deleted: a wrong entry is archived.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("usage_entries", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.bigInteger("engine_id").unsigned().notNullable().references("id").inTable("engines").onDelete("CASCADE");
    t.date("occurred_on").notNullable();
    t.string("session_label", 80).nullable();
    t.string("event_label", 120).nullable();
    t.decimal("amount", 10, 2).notNullable();
    t.enu("source", ["manual", "meter", "import"]).notNullable();
    t.bigInteger("installation_id").unsigned().nullable().references("id").inTable("installations").onDelete("SET NULL");
    t.decimal("meter_reading", 12, 2).nullable();
    t.string("import_key", 64).nullable();
    t.string("logged_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.string("notes", 500).nullable();
    t.datetime("archived_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.unique(["organisation_id", "import_key"]);
    t.index(["engine_id", "archived_at", "occurred_on", "amount"], "usage_entries_engine_counters");
    t.index(["organisation_id", "occurred_on"]);
    t.index(["installation_id", "meter_reading"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("usage_entries");
}
