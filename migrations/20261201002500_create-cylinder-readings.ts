import type { Knex } from "knex";

/** Per cylinder, exactly as typed: repeated burette readings, flat plate, squish both sides, cranking, leak-down. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("cylinder_readings", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("reading_set_id").unsigned().notNullable().references("id").inTable("reading_sets").onDelete("CASCADE");
    t.tinyint("cylinder_no").unsigned().notNullable();
    t.json("chamber_readings_cc").notNullable();
    t.decimal("flat_plate_cc", 7, 2).nullable();
    t.decimal("squish_a_mm", 5, 3).nullable();
    t.decimal("squish_b_mm", 5, 3).nullable();
    t.decimal("cranking_kpa", 7, 1).nullable();
    t.decimal("leakdown_pct", 5, 1).nullable();
    t.string("notes", 500).nullable();
    t.timestamps(true, true);
    t.unique(["reading_set_id", "cylinder_no"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("cylinder_readings");
}
