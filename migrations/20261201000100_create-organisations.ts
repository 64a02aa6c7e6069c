import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("organisations", (t) => {
    t.bigIncrements("id").primary();
    t.string("name", 120).notNullable();
    t.string("slug", 80).notNullable().unique();
    t.string("time_zone", 64).notNullable().defaultTo("UTC");
    t.enu("usage_unit", ["hours", "kilometres", "laps", "litres"]).notNullable().defaultTo("hours");
    t.enu("unit_system", ["metric", "imperial"]).notNullable().defaultTo("metric");
    t.integer("shop_elevation_m").nullable();
    t.timestamps(true, true);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("organisations");
}
