import type { Knex } from "knex";

/** A crew chief's own thresholds for one engine, laid over the organisation's. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("engines", (t) => {
    t.json("signal_thresholds").nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("engines", (t) => {
    t.dropColumn("signal_thresholds");
  });
}
