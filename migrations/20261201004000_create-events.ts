import type { Knex } from "knex";

/** The season's events: dates, venue, elevation above sea level (geometric), expected air temperature. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("events", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.string("name", 120).notNullable();
    t.string("venue", 120).nullable();
    t.date("starts_on").notNullable();
    t.date("ends_on").notNullable();
    t.integer("elevation_m").notNullable();
    t.decimal("expected_air_temp_c", 4, 1).nullable();
    t.enu("kind", ["practice", "race", "test"]).notNullable().defaultTo("race");
    t.boolean("important").notNullable().defaultTo(false);
    t.text("notes").nullable();
    t.datetime("archived_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.index(["organisation_id", "starts_on"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("events");
}
