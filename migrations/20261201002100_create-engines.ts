import type { Knex } from "knex";

/**
 * Engines: identity, build spec, status and service policy. Lengths in mm, volumes in cc,
 * elevations in m; limits in the organisation's usage unit. Never deleted: archived_at.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("engines", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.string("name", 60).notNullable();
    t.string("serial", 80).nullable();
    t.enu("cycle", ["two_stroke", "four_stroke"]).notNullable().defaultTo("two_stroke");
    t.tinyint("cylinders").unsigned().notNullable();
    t.decimal("bore_mm", 7, 3).notNullable();
    t.decimal("stroke_mm", 7, 3).notNullable();
    t.decimal("rod_mm", 7, 3).nullable();
    t.decimal("exhaust_opens_deg_atdc", 5, 2).nullable();
    t.decimal("target_ratio", 5, 2).nullable();
    t.decimal("target_squish_mm", 5, 2).nullable();
    t.string("build_fuel_note", 200).nullable();
    t.decimal("build_min_octane", 4, 1).nullable();
    t.integer("built_for_min_elevation_m").nullable();
    t.integer("built_for_max_elevation_m").nullable();
    t.bigInteger("racing_class_id").unsigned().nullable().references("id").inTable("racing_classes").onDelete("SET NULL");
    t.enu("status", ["running", "bench", "spare", "retired"]).notNullable().defaultTo("spare");
    t.text("notes").nullable();
    t.decimal("top_end_limit", 10, 2).nullable();
    t.decimal("bottom_end_limit", 10, 2).nullable();
    t.decimal("inspection_interval", 10, 2).nullable();
    t.decimal("plan_fraction", 3, 2).notNullable().defaultTo(0.8);
    t.datetime("archived_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.unique(["organisation_id", "name"]);
    t.index(["organisation_id", "status", "name"]);
    t.index(["organisation_id", "archived_at", "name"]);
    t.index(["organisation_id", "serial"]);
    t.index(["racing_class_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("engines");
}
