import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("sessions", (t) => {
    t.string("id", 64).primary();
    t.string("user_id", 40).notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.datetime("expires_at", { precision: 3 }).notNullable();
    t.timestamps(true, true);
    t.index(["user_id"]);
    t.index(["expires_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("sessions");
}
