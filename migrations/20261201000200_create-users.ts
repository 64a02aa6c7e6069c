import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("users", (t) => {
    t.string("id", 40).primary();
    t.string("email", 254).notNullable().unique();
    t.string("name", 120).notNullable();
    t.string("password_hash", 255).nullable();
    t.bigInteger("last_org_id").unsigned().nullable().references("id").inTable("organisations").onDelete("SET NULL");
    t.enu("unit_system", ["metric", "imperial"]).nullable();
    t.timestamps(true, true);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("users");
}
