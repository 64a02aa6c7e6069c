import type { Knex } from "knex";

/**
 * Rebuild and inspection records. The counters "since last top end / bottom end / inspection"
 * start the day after the latest one. job_id is left for the bench's jobs to point back to.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("services", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.bigInteger("engine_id").unsigned().notNullable().references("id").inTable("engines").onDelete("CASCADE");
    t.enu("kind", ["top_end", "bottom_end", "inspection"]).notNullable();
    t.date("done_on").notNullable();
    t.bigInteger("job_id").unsigned().nullable();
    t.string("done_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("notes").nullable();
    t.datetime("archived_at", { precision: 3 }).nullable();
    t.timestamps(true, true);
    t.index(["engine_id", "kind", "done_on"]);
    t.index(["organisation_id", "done_on"]);
    t.index(["job_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("services");
}
