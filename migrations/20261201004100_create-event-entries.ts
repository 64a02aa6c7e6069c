import type { Knex } from "knex";

/**
 * A chassis entered in an event with the usage it is expected to add; the engine that runs it
 * comes from the accepted plan, or from a manager's pin. The crew chief records the fuel run.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("event_entries", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("event_id").unsigned().notNullable().references("id").inTable("events").onDelete("CASCADE");
    t.bigInteger("chassis_id").unsigned().notNullable().references("id").inTable("chassis").onDelete("CASCADE");
    t.decimal("expected_usage", 8, 2).notNullable();
    t.bigInteger("engine_id").unsigned().nullable().references("id").inTable("engines").onDelete("SET NULL");
    t.boolean("engine_pinned").notNullable().defaultTo(false);
    t.string("fuel_run", 200).nullable();
    t.string("fuel_decided_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.datetime("fuel_decided_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.unique(["event_id", "chassis_id"]);
    t.index(["engine_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("event_entries");
}
