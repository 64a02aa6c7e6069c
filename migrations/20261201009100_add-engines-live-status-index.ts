import type { Knex } from "knex";

/**
 * Live engines counted by status (the Overview) and the roster filtered by status: with this
 * index both are answered from the index alone instead of reading every engine row.
 */
const NAME = "engines_org_live_status";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("engines", (t) => {
    t.index(["organisation_id", "archived_at", "status"], NAME);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("engines", (t) => {
    t.dropIndex(["organisation_id", "archived_at", "status"], NAME);
  });
}
