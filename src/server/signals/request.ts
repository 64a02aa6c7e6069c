import type { Knex } from "knex";

/**
 * Marks an organisation for a signal check within a minute (after a reading set or usage is saved).
 * Call it first in the write's transaction. Inserting a row that refers to the organisation takes
 * a shared lock on the organisation row (the foreign key check); updating that row afterwards
 * needs it exclusively, and two such writes of one organisation at the same moment then wait on
 * each other: a deadlock, and a 500 for one of them. Taken first, the lock makes them queue.
 */
export async function requestSignalCheck(k: Knex, organisationId: number, now: Date = new Date()): Promise<void> {
  await k("organisations").where({ id: organisationId }).update({ signals_requested_at: now });
}
