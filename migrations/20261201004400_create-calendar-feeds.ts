import type { Knex } from "knex";

/** A secret, revocable link per person and organisation to the plan as an iCalendar feed. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("calendar_feeds", (t) => {
    t.bigIncrements("id").primary();
    t.string("token_hash", 64).notNullable().unique();
    t.string("user_id", 40).notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.datetime("revoked_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.index(["user_id", "organisation_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("calendar_feeds");
}
