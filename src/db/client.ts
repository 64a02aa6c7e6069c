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

/** True when an error means the database cannot be reached right now (the app answers 503). */
export function isDatabaseUnavailable(err: unknown): boolean {
  const e = err as { code?: string; name?: string; message?: string } | null;
  if (!e) return false;
  if (e.code && UNAVAILABLE_CODES.has(e.code)) return true;
  if (e.name === "KnexTimeoutError") return true;
  return /Connection lost|connect ECONNREFUSED|Pool is closed|server has gone away/i.test(e.message ?? "");
}
