import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("password_resets", (t) => {
    t.bigIncrements("id").primary();
    t.string("user_id", 40).notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.string("token_hash", 64).notNullable().unique();
    t.datetime("expires_at", { precision: 3 }).notNullable();
    t.datetime("used_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("password_resets");
}
