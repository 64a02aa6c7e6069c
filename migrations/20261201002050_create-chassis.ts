import type { Knex } from "knex";

/** A sled, bike, kart or vehicle an engine runs in; the usage meter (if any) sits here. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("chassis", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.string("number", 20).notNullable();
    t.enu("kind", ["sled", "bike", "kart", "atv", "utv", "car", "other"]).notNullable();
    t.enu("meter_kind", ["hours", "km", "none"]).notNullable().defaultTo("none");
    t.text("notes").nullable();
    t.datetime("archived_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.unique(["organisation_id", "number"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("chassis");
}
