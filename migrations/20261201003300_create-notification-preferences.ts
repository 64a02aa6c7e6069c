import type { Knex } from "knex";

/**
 * What mail each person wants, per organisation and per topic: at once, in a morning digest, or
 * none. Without a row the role's default applies. `mail_token` lets an unsubscribe link work
 * without signing in.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("notification_preferences", (t) => {
    t.bigIncrements("id").primary();
    t.string("user_id", 40).notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.enu("topic", ["drift", "due", "jobs"]).notNullable();
    t.enu("mode", ["immediate", "digest", "off"]).notNullable();
    t.timestamps(true, true);
    t.unique(["user_id", "organisation_id", "topic"]);
  });
  await knex.schema.createTable("mail_tokens", (t) => {
    t.string("token", 64).primary();
    t.string("user_id", 40).notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.timestamps(true, true);
    t.unique(["user_id", "organisation_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("mail_tokens");
  await knex.schema.dropTable("notification_preferences");
}
