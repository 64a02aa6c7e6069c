import knexFactory, { type Knex } from "knex";
import config from "../../knexfile.ts";

let instance: Knex | null = null;

/** The one Knex instance of this process (utf8mb4, UTC). */
export function db(): Knex {
  instance ??= knexFactory(config);
  return instance;
}

export async function closeDb(): Promise<void> {
  if (instance) await instance.destroy();
  instance = null;
}

const UNAVAILABLE_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "PROTOCOL_CONNECTION_LOST",
  "ETIMEDOUT",
  "ER_CON_COUNT_ERROR",
  "ER_SERVER_SHUTDOWN",
  "EPIPE",
]);

/**
 * True when an error means the database cannot be reached right now (the app answers 503).
 * mysql2 marks every error that ends a connection `fatal`: a lost connection, a command on a
 * closed one (the ROLLBACK Knex sends after a query failed that way), a failed handshake. The
 * pool drops such a connection (Knex checks it before lending it again), so the next request
 * gets a fresh one once the server is back: no restart needed.
 */
export function isDatabaseUnavailable(err: unknown): boolean {
  const e = err as { code?: string; name?: string; message?: string; fatal?: boolean } | null;
  if (!e) return false;
  if (e.code && UNAVAILABLE_CODES.has(e.code)) return true;
  if (e.fatal === true) return true;
  if (e.name === "KnexTimeoutError") return true;
  return /Connection lost|connect ECONNREFUSED|Pool is closed|server has gone away|connection is in closed state/i.test(e.message ?? "");
}

/**
 * True when the connection failed on the COMMIT itself: the server may have made the change
 * durable and lost only its answer, so nobody can say whether the write happened. Knex puts the
 * failed statement in front of the message ("COMMIT; - Connection lost…").
 */
export function isCommitOutcomeUnknown(err: unknown): boolean {
  return isDatabaseUnavailable(err) && /^COMMIT;? - /.test((err as { message?: string } | null)?.message ?? "");
}
