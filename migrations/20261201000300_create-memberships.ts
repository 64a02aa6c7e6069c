import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("memberships", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.string("user_id", 40).notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.enu("role", ["owner", "manager", "crew_chief", "mechanic", "viewer"]).notNullable();
    t.timestamps(true, true);
    t.unique(["organisation_id", "user_id"]);
    t.index(["user_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("memberships");
}
