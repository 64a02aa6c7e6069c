import type { Knex } from "knex";

/** Failed sign-ins per account and per address, so the rate limit holds across restarts and servers. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("sign_in_attempts", (t) => {
    t.bigIncrements("id").primary();
    t.enu("scope", ["account", "address"]).notNullable();
    t.string("subject", 254).notNullable();
    t.datetime("attempted_at", { precision: 3 }).notNullable();
    t.index(["scope", "subject", "attempted_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("sign_in_attempts");
}
