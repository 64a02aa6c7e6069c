/**
 * Brings up what Ringland needs around the web server: MariaDB, the mail catcher, the S3 fake,
 * migrations, the demo seed and a build of the app. Shared by `npm start` and `npm test`.
 */
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { ensureMariaDbInstalled, startMariaDb, type MariaDbHandle } from "./mariadb.ts";
import { httpOk, isPortOpen, startChild, waitFor, type Child } from "./processes.ts";

export const ROOT = resolve(import.meta.dirname, "../..");
/** Where the built app lives: dist/ unless RINGLAND_BUILD_DIR names another folder. */
export const DIST = process.env.RINGLAND_BUILD_DIR ? join(resolve(process.env.RINGLAND_BUILD_DIR), "dist") : join(ROOT, "dist");
export const SERVER_ENTRY = join(DIST, "server", "entry.mjs");

export interface StackConfig {
  dataDir: string;
  dbPort: number;
  dbName: string;
  dbUser: string;
  dbPassword: string;
  smtpPort: number;
  mailInboxPort: number;
  s3Port: number;
  webPort: number;
  quiet?: boolean;
}

export interface Stack {
  env: NodeJS.ProcessEnv;
  db: MariaDbHandle;
  children: Child[];
  stopAll(): Promise<void>;
}

export const log = (line: string): void => {
  process.stdout.write(`ringland: ${line}\n`);
};

export function childEnv(cfg: StackConfig, nodeEnv: string): NodeJS.ProcessEnv {
  const base = { ...process.env };
  delete base.NODE_OPTIONS;
  return {
    ...base,
    NODE_ENV: nodeEnv,
    ASTRO_TELEMETRY_DISABLED: "1",
    HOST: "127.0.0.1",
    PORT: String(cfg.webPort),
    APP_URL: process.env.APP_URL ?? `http://localhost:${cfg.webPort}`,
    DB_HOST: "127.0.0.1",
    DB_PORT: String(cfg.dbPort),
    DB_NAME: cfg.dbName,
    DB_USER: cfg.dbUser,
    DB_PASSWORD: cfg.dbPassword,
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(cfg.smtpPort),
    MAIL_INBOX_PORT: String(cfg.mailInboxPort),
    MAIL_DIR: join(cfg.dataDir, "mail"),
    S3_PORT: String(cfg.s3Port),
    S3_DIR: join(cfg.dataDir, "s3"),
    S3_ENDPOINT: `http://127.0.0.1:${cfg.s3Port}`,
    S3_BUCKET: process.env.S3_BUCKET ?? "ringland-uploads",
  };
}

export function runNode(args: string[], env: NodeJS.ProcessEnv, what: string): void {
  const r = spawnSync(process.execPath, args, { cwd: ROOT, env, stdio: "inherit" });
  if (r.status !== 0) throw new Error(`${what} failed (exit ${r.status})`);
}

export function migrate(env: NodeJS.ProcessEnv): void {
  runNode(["--import", "tsx", "node_modules/knex/bin/cli.js", "--knexfile", "knexfile.ts", "migrate:latest"], env, "migrations");
}

export function seed(env: NodeJS.ProcessEnv): void {
  runNode(["--import", "tsx", "node_modules/knex/bin/cli.js", "--knexfile", "knexfile.ts", "seed:run"], env, "demo seed");
}

function hashTree(hash: ReturnType<typeof createHash>, path: string): void {
  const st = statSync(path);
  if (st.isDirectory()) {
    for (const name of readdirSync(path).sort()) hashTree(hash, join(path, name));
  } else {
    hash.update(path);
    hash.update(readFileSync(path));
  }
}

/** Builds the app unless dist/ already holds a build of exactly these sources. */
export function buildIfStale(env: NodeJS.ProcessEnv): void {
  const hash = createHash("sha256");
  for (const p of ["src", "public", "astro.config.mjs", "tailwind.config.mjs", "package-lock.json", "tsconfig.json"]) {
    const full = join(ROOT, p);
    if (existsSync(full)) hashTree(hash, full);
  }
  const digest = hash.digest("hex");
  const stamp = join(DIST, ".ringland-build");
  if (existsSync(stamp) && readFileSync(stamp, "utf8") === digest && existsSync(SERVER_ENTRY)) {
    log("build is up to date");
    return;
  }
  log("building the app (about 20 s)…");
  runNode(["node_modules/astro/astro.js", "build"], { ...env, NODE_ENV: "production" }, "astro build");
  writeFileSync(stamp, digest);
}

export async function startBackingServices(cfg: StackConfig): Promise<Stack> {
  ensureMariaDbInstalled(log);
  for (const [what, port] of [
    ["SMTP catcher", cfg.smtpPort],
    ["mail inbox", cfg.mailInboxPort],
    ["S3 fake", cfg.s3Port],
  ] as const) {
    if (await isPortOpen(port)) throw new Error(`port ${port} for the ${what} is already in use; set another in .env`);
  }
  const db = await startMariaDb(
    { dataDir: join(cfg.dataDir, "mariadb"), port: cfg.dbPort, database: cfg.dbName, user: cfg.dbUser, password: cfg.dbPassword },
    log,
  );
  const env = childEnv(cfg, "development");
  const children: Child[] = [];
  const stopAll = async (): Promise<void> => {
    for (const c of [...children].reverse()) await c.stop();
    await db.stop();
  };
  try {
    const mail = startChild("mail", ["--import", "tsx", "scripts/services/mail-catcher.ts"], env, { quiet: cfg.quiet, cwd: ROOT });
    children.push(mail);
    const s3 = startChild("s3", ["--import", "tsx", "scripts/services/s3-fake.ts"], env, { quiet: cfg.quiet, cwd: ROOT });
    children.push(s3);
    await waitFor("mail catcher", () => httpOk(`http://127.0.0.1:${cfg.mailInboxPort}/health`), mail);
    await waitFor("S3 fake", () => isPortOpen(cfg.s3Port), s3);
  } catch (err) {
    await stopAll();
    throw err;
  }
  return { env, db, children, stopAll };
}
