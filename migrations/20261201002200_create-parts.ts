import type { Knex } from "knex";

/** Serialised parts with their own limits; engine_id is where the part is now (null: on the shelf). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("parts", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.string("serial", 80).notNullable();
    t.enu("kind", ["piston", "rings", "crank", "rod", "cylinder", "head", "insert", "other"]).notNullable();
    t.string("description", 200).nullable();
    t.bigInteger("engine_id").unsigned().nullable().references("id").inTable("engines").onDelete("SET NULL");
    t.tinyint("cylinder_no").unsigned().nullable();
    t.decimal("usage_limit", 10, 2).nullable();
    t.decimal("initial_usage", 10, 2).notNullable().defaultTo(0);
    t.decimal("max_total_cut_mm", 6, 3).nullable();
    t.decimal("max_oversize_mm", 6, 3).nullable();
    t.decimal("total_cut_mm", 6, 3).notNullable().defaultTo(0);
    t.decimal("oversize_mm", 6, 3).notNullable().defaultTo(0);
    t.text("notes").nullable();
    t.datetime("archived_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.unique(["organisation_id", "kind", "serial"]);
    t.index(["engine_id", "kind"]);
    t.index(["organisation_id", "archived_at", "kind"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("parts");
}
