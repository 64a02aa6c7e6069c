import type { Knex } from "knex";

/** Machining on a part: head or insert cuts (with the running total) and rebores to an oversize. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("part_events", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.bigInteger("part_id").unsigned().notNullable().references("id").inTable("parts").onDelete("CASCADE");
    t.bigInteger("engine_id").unsigned().nullable().references("id").inTable("engines").onDelete("SET NULL");
    t.enu("kind", ["cut", "oversize"]).notNullable();
    t.decimal("amount_mm", 6, 3).notNullable();
    t.decimal("total_after_mm", 6, 3).notNullable();
    t.date("done_on").notNullable();
    t.string("done_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("notes").nullable();
    t.timestamps(true, true);
    t.index(["part_id", "done_on"]);
    t.index(["engine_id", "done_on"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("part_events");
}
