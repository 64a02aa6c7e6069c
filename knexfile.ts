import type { Knex } from "knex";
import { env } from "./src/server/env.ts";

const config: Knex.Config = {
  client: "mysql2",
  connection: {
    host: env.DB_HOST,
    port: env.DB_PORT,
    user: env.DB_USER,
    password: env.DB_PASSWORD,
    database: env.DB_NAME,
    charset: "utf8mb4",
    timezone: "Z",
    // Calendar days (events, readings) come back as "YYYY-MM-DD", never shifted by a time zone.
    dateStrings: ["DATE"] as unknown as boolean,
    decimalNumbers: true,
  },
  pool: { min: 0, max: env.DB_POOL_MAX },
  // A request that waits this long for a connection is answered 503 rather than kept hanging
  // (the default is a minute). Connections that died with the server are dropped by Knex's
  // check before reuse, so after an outage the pool refills by itself.
  acquireConnectionTimeout: 10_000,
  migrations: { directory: "./migrations", extension: "ts", loadExtensions: [".ts"], tableName: "knex_migrations" },
  seeds: { directory: "./seeds", extension: "ts", loadExtensions: [".ts"] },
};

export default config;
