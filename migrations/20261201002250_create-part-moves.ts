import type { Knex } from "knex";

/** Every time a part went into or out of an engine. A part's stints follow from consecutive moves. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("part_moves", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.bigInteger("part_id").unsigned().notNullable().references("id").inTable("parts").onDelete("CASCADE");
    t.bigInteger("from_engine_id").unsigned().nullable().references("id").inTable("engines").onDelete("CASCADE");
    t.bigInteger("to_engine_id").unsigned().nullable().references("id").inTable("engines").onDelete("CASCADE");
    t.tinyint("to_cylinder_no").unsigned().nullable();
    t.date("moved_on").notNullable();
    t.string("moved_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("notes").nullable();
    t.timestamps(true, true);
    t.index(["part_id", "moved_on"]);
    t.index(["to_engine_id", "moved_on"]);
    t.index(["from_engine_id", "moved_on"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("part_moves");
}
