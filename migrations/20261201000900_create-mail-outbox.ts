import type { Knex } from "knex";

/**
 * Every mail goes through this table: written in the same transaction as the change that causes
 * it, delivered afterwards, retried with backoff. The unique key stops a second copy.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("mail_outbox", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().nullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.string("dedupe_key", 191).notNullable().unique();
    t.string("to_address", 254).notNullable();
    t.string("subject", 255).notNullable();
    t.text("body_text", "mediumtext").notNullable();
    t.text("body_html", "mediumtext").nullable();
    t.json("headers").nullable();
    t.enu("status", ["pending", "sending", "sent", "failed"]).notNullable().defaultTo("pending");
    t.integer("attempts").notNullable().defaultTo(0);
    t.datetime("next_attempt_at", { precision: 3 }).notNullable();
    t.string("claimed_by", 64).nullable();
    t.datetime("claimed_until", { precision: 3 }).nullable();
    t.text("last_error").nullable();
    t.datetime("sent_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.index(["status", "next_attempt_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("mail_outbox");
}
