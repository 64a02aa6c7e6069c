import type { Knex } from "knex";

/** Marks an organisation for a signal check within a minute (after a reading set or usage is saved). */
export async function requestSignalCheck(k: Knex, organisationId: number, now: Date = new Date()): Promise<void> {
  await k("organisations").where({ id: organisationId }).update({ signals_requested_at: now });
}
