import type { Knex } from "knex";

// Per-quantity unit choices ({ length: "in", pressure: "bar", … }) a person picked on the
// Workbench; null means "follow users.unit_system, else the organisation's".
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("users", (t) => {
    t.json("unit_choices").nullable().after("unit_system");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("users", (t) => {
    t.dropColumn("unit_choices");
  });
}
