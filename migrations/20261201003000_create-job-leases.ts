import type { Knex } from "knex";

/**
 * Which process runs the scheduled jobs: a row per job, taken and renewed in a transaction with
 * an expiry. Unlike GET_LOCK it lives in a table, so a Galera cluster shares it between nodes.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("job_leases", (t) => {
    t.string("name", 64).primary();
    t.string("holder", 64).notNullable();
    t.datetime("expires_at", { precision: 3 }).notNullable();
    t.datetime("acquired_at", { precision: 3 }).notNullable();
    t.datetime("renewed_at", { precision: 3 }).notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("job_leases");
}
