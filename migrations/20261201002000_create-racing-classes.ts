import type { Knex } from "knex";

/** A racing class's rules, stored as data per organisation (classes differ between sanctioning bodies). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("racing_classes", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.string("name", 80).notNullable();
    t.decimal("min_squish_mm", 5, 2).nullable();
    t.decimal("min_chamber_cc", 7, 2).nullable();
    t.decimal("min_flat_plate_cc", 7, 2).nullable();
    t.decimal("max_displacement_cc", 8, 1).nullable();
    t.string("squish_wire_note", 200).nullable();
    t.text("notes").nullable();
    t.datetime("archived_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.unique(["organisation_id", "name"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("racing_classes");
}
