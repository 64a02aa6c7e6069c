import type { Knex } from "knex";

/**
 * Each accepted rebuild plan: the day it was planned from, who accepted it, and what the planner
 * said about it (conflicts, warnings, explanations, projected due dates, usage left per entry).
 * The assignments and jobs themselves live in event_entries.engine_id and jobs; the latest row
 * per organisation is the current plan.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("season_plans", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.date("planned_from").notNullable();
    t.string("accepted_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.enu("cause", ["replan", "move", "pin", "job", "seed"]).notNullable();
    t.json("conflicts").notNullable();
    t.json("warnings").notNullable();
    t.json("explanations").notNullable();
    t.json("watch_points").notNullable();
    t.json("usage_left").notNullable();
    t.json("stats").notNullable();
    t.timestamps(true, true);
    t.index(["organisation_id", "id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("season_plans");
}
