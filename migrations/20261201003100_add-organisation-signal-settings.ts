import type { Knex } from "knex";

/** Per-organisation settings of the signal check: schedule, thresholds, fuel table, run markers. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("organisations", (t) => {
    t.string("signal_schedule", 64).notNullable().defaultTo("0 6 * * *");
    t.json("signal_thresholds").nullable();
    t.json("fuel_table").nullable();
    t.decimal("chamber_tolerance_cc", 5, 2).notNullable().defaultTo(0.2);
    t.datetime("signals_requested_at", { precision: 3 }).nullable();
    t.datetime("signals_checked_at", { precision: 3 }).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("organisations", (t) => {
    t.dropColumn("signal_schedule");
    t.dropColumn("signal_thresholds");
    t.dropColumn("fuel_table");
    t.dropColumn("chamber_tolerance_cc");
    t.dropColumn("signals_requested_at");
    t.dropColumn("signals_checked_at");
  });
}
