import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("invitations", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.string("email", 254).notNullable();
    t.enu("role", ["owner", "manager", "crew_chief", "mechanic", "viewer"]).notNullable();
    t.string("token_hash", 64).notNullable().unique();
    t.string("invited_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.datetime("expires_at", { precision: 3 }).notNullable();
    t.datetime("accepted_at", { precision: 3 }).nullable();
    t.datetime("revoked_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.index(["organisation_id", "email"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("invitations");
}
