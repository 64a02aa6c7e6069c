import type { Knex } from "knex";

/** One teardown, between-events or build measurement of an engine, where and when it was taken. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("reading_sets", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.bigInteger("engine_id").unsigned().notNullable().references("id").inTable("engines").onDelete("CASCADE");
    t.date("taken_on").notNullable();
    t.string("taken_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.integer("elevation_m").notNullable();
    t.decimal("air_temp_c", 4, 1).nullable();
    t.text("method_notes").nullable();
    t.boolean("is_baseline").notNullable().defaultTo(false);
    t.enu("set_kind", ["teardown", "between_events", "build"]).notNullable();
    t.datetime("archived_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.index(["engine_id", "taken_on"]);
    t.index(["engine_id", "is_baseline", "taken_on"]);
    t.index(["organisation_id", "taken_on"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("reading_sets");
}
