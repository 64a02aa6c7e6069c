import type { Knex } from "knex";

/**
 * Which engine ran in which chassis from when to when, with the chassis meter at both ends.
 * The generated open_* columns hold the id only while the installation is open, so their unique
 * indexes refuse a second open installation per engine and per chassis even under a race.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("installations", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("organisation_id").unsigned().notNullable().references("id").inTable("organisations").onDelete("CASCADE");
    t.bigInteger("engine_id").unsigned().notNullable().references("id").inTable("engines").onDelete("CASCADE");
    t.bigInteger("chassis_id").unsigned().notNullable().references("id").inTable("chassis").onDelete("CASCADE");
    t.datetime("installed_at", { precision: 3 }).notNullable();
    t.datetime("removed_at", { precision: 3 }).nullable();
    t.decimal("meter_at_install", 12, 2).nullable();
    t.decimal("meter_at_removal", 12, 2).nullable();
    t.string("installed_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.string("removed_by", 40).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("notes").nullable();
    t.timestamps(true, true);
    t.index(["engine_id", "installed_at"]);
    t.index(["chassis_id", "installed_at"]);
    t.index(["organisation_id", "removed_at"]);
  });
  await knex.raw(
    "ALTER TABLE installations" +
      " ADD COLUMN open_engine_id BIGINT UNSIGNED AS (IF(removed_at IS NULL, engine_id, NULL)) PERSISTENT," +
      " ADD COLUMN open_chassis_id BIGINT UNSIGNED AS (IF(removed_at IS NULL, chassis_id, NULL)) PERSISTENT," +
      " ADD UNIQUE INDEX installations_one_open_per_engine (open_engine_id)," +
      " ADD UNIQUE INDEX installations_one_open_per_chassis (open_chassis_id)",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("installations");
}
