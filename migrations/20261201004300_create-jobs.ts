import type { Knex } from "knex";

/**
 * Bench jobs: top end, bottom end, inspection. A planned job comes from the accepted plan (or a
 * manager's pin); finishing one writes a `services` row, which resets the engine's counters.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("jobs", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.bigInteger("engine_id").unsigned().notNullable().references("id").inTable("engines").onDelete("CASCADE");
    t.enu("kind", ["top_end", "bottom_end", "inspection"]).notNullable();
    t.enu("state", ["planned", "in_progress", "done", "cancelled"]).notNullable().defaultTo("planned");
    t.date("starts_on").notNullable();
    t.date("ends_on").notNullable();
    t.json("hours_by_date").nullable();
    t.decimal("labour_hours_planned", 6, 2).notNullable();
    t.decimal("labour_hours_actual", 6, 2).nullable();
    t.boolean("pinned").notNullable().defaultTo(false);
    t.bigInteger("for_event_id").unsigned().nullable().references("id").inTable("events").onDelete("SET NULL");
    t.text("reason").nullable();
    t.json("checklist").notNullable();
    t.string("assigned_to", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.string("done_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.date("done_on").nullable();
    t.text("notes").nullable();
    t.timestamps(true, true);
    t.index(["organisation_id", "state", "starts_on"]);
    t.index(["engine_id", "state"]);
  });
  await knex.schema.createTable("job_parts", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("job_id").unsigned().notNullable().references("id").inTable("jobs").onDelete("CASCADE");
    t.bigInteger("part_id").unsigned().nullable().references("id").inTable("parts").onDelete("SET NULL");
    t.string("description", 200).notNullable();
    t.integer("quantity").notNullable().defaultTo(1);
    t.timestamps(true, true);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("job_parts");
  await knex.schema.dropTable("jobs");
}
