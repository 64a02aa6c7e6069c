import type { Knex } from "knex";

/** The shop's hands: mechanic hours per weekday, job lengths, parts lead time, and closed days. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("shop_settings", (t) => {
    t.bigInteger("organisation_id").unsigned().primary().references("id").inTable("organisations").onDelete("CASCADE");
    t.json("hours_per_weekday").notNullable(); // Monday first, 7 numbers
    t.integer("travel_days_before_event").notNullable().defaultTo(1);
    t.decimal("top_end_hours", 5, 1).notNullable().defaultTo(4);
    t.decimal("bottom_end_hours", 5, 1).notNullable().defaultTo(12);
    t.decimal("inspection_hours", 5, 1).notNullable().defaultTo(1.5);
    t.integer("parts_lead_days").notNullable().defaultTo(3);
    t.timestamps(true, true);
  });
  await knex.schema.createTable("shop_closed_days", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.date("day").notNullable();
    t.string("reason", 120).nullable();
    t.timestamps(true, true);
    t.unique(["organisation_id", "day"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("shop_closed_days");
  await knex.schema.dropTable("shop_settings");
}
