import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("audit_log", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().nullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.string("actor_user_id", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.string("action", 80).notNullable();
    t.string("entity", 60).notNullable();
    t.string("entity_id", 60).nullable();
    t.json("details").nullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["organisation_id", "created_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("audit_log");
}
