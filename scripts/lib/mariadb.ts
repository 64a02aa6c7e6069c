/**
 * A private MariaDB instance for one checkout: data under a folder of ours, bound to 127.0.0.1 on
 * its own port with its own socket, never the system service. Used by `npm start` and `npm test`.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, openSync, readFileSync, rmSync } from "node:fs";
import { join, resolve } from "node:path";
import { tmpdir } from "node:os";
import { createHash } from "node:crypto";

export interface MariaDbOptions {
  dataDir: string; // the instance's own folder (datadir, pid, log live inside)
  port: number;
  database: string;
  user: string;
  password: string;
}

export interface MariaDbHandle {
  socket: string;
  process: ChildProcess | null;
  stop(): Promise<void>;
}

const BINARIES = ["mariadbd", "mariadb-install-db", "mariadb-admin", "mariadb"];

function findBinary(name: string): string | null {
  for (const dir of ["/usr/sbin", "/usr/bin", "/usr/local/sbin", "/usr/local/bin"]) {
    const path = join(dir, name);
    if (existsSync(path)) return path;
  }
  return null;
}

export function ensureMariaDbInstalled(log: (line: string) => void): void {
  if (BINARIES.every((b) => findBinary(b))) return;
  const isRoot = typeof process.getuid === "function" && process.getuid() === 0;
  const command = "apt-get update && apt-get install -y mariadb-server";
  if (!isRoot) {
    throw new Error(
      `MariaDB is not installed and this user cannot install it.\nRun as root:\n  sudo sh -c '${command}'\nthen run this command again.`,
    );
  }
  log("MariaDB server not found: installing Debian's mariadb-server (about 30 s)…");
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  for (const args of [["update", "-qq"], ["install", "-y", "-qq", "mariadb-server"]]) {
    const r = spawnSync("apt-get", args, { stdio: "inherit", env });
    if (r.status !== 0) throw new Error(`'apt-get ${args.join(" ")}' failed (exit ${r.status}).`);
  }
  if (!BINARIES.every((b) => findBinary(b))) throw new Error("mariadb-server installed but its binaries were not found.");
}

/** Unix sockets are limited to 107 bytes, so long checkout paths get a short socket in /tmp. */
export function socketPathFor(dataDir: string): string {
  const local = join(dataDir, "mysqld.sock");
  if (Buffer.byteLength(local) <= 100) return local;
  const hash = createHash("sha1").update(dataDir).digest("hex").slice(0, 12);
  return join(tmpdir(), `ringland-${hash}.sock`);
}

function admin(socket: string, args: string[]): { ok: boolean; output: string } {
  const r = spawnSync(findBinary("mariadb-admin")!, ["--no-defaults", `--socket=${socket}`, "-uroot", ...args], {
    encoding: "utf8",
    timeout: 60_000,
  });
  return { ok: r.status === 0, output: `${r.stdout ?? ""}${r.stderr ?? ""}` };
}

function sql(socket: string, statement: string): void {
  const r = spawnSync(findBinary("mariadb")!, ["--no-defaults", `--socket=${socket}`, "-uroot", "-e", statement], {
    encoding: "utf8",
    timeout: 60_000,
  });
  if (r.status !== 0) throw new Error(`MariaDB statement failed: ${r.stderr}`);
}

function sleep(ms: number): Promise<void> {
  return new Promise((r) => setTimeout(r, ms));
}

function tailLog(logFile: string): string {
  try {
    return readFileSync(logFile, "utf8").split("\n").slice(-15).join("\n");
  } catch {
    return "(no log)";
  }
}

export async function startMariaDb(opts: MariaDbOptions, log: (line: string) => void): Promise<MariaDbHandle> {
  const dataDir = resolve(opts.dataDir);
  const datadir = join(dataDir, "data");
  const socket = socketPathFor(dataDir);
  const pidFile = join(dataDir, "mariadbd.pid");
  const logFile = join(dataDir, "mariadbd.log");
  mkdirSync(dataDir, { recursive: true });

  // Reuse an instance that is already up (a second `npm start`, or one left from a crash).
  if (admin(socket, ["ping"]).ok) {
    log(`MariaDB already running on socket ${socket}`);
    createDatabaseAndUser(socket, opts);
    return { socket, process: null, stop: async () => stopBySocket(socket) };
  }

  if (!existsSync(join(datadir, "mysql"))) {
    rmSync(datadir, { recursive: true, force: true });
    mkdirSync(datadir, { recursive: true });
    const user = userName();
    const r = spawnSync(
      findBinary("mariadb-install-db")!,
      ["--no-defaults", `--datadir=${datadir}`, `--user=${user}`, "--skip-test-db", "--auth-root-authentication-method=socket"],
      { encoding: "utf8" },
    );
    if (r.status !== 0) throw new Error(`mariadb-install-db failed:\n${r.stderr}`);
    log(`MariaDB data folder created at ${datadir}`);
  }

  const out = openSync(logFile, "a");
  const child = spawn(
    findBinary("mariadbd")!,
    [
      "--no-defaults",
      `--datadir=${datadir}`,
      `--socket=${socket}`,
      `--pid-file=${pidFile}`,
      `--port=${opts.port}`,
      "--bind-address=127.0.0.1",
      `--user=${userName()}`,
      `--log-error=${logFile}`,
      "--skip-name-resolve",
      "--character-set-server=utf8mb4",
      "--collation-server=utf8mb4_unicode_ci",
      "--innodb-buffer-pool-size=256M",
      "--max-connections=300",
    ],
    { stdio: ["ignore", out, out], detached: false },
  );
  let exited = false;
  child.on("exit", () => {
    exited = true;
  });

  const deadline = Date.now() + 60_000;
  while (!admin(socket, ["ping"]).ok) {
    if (exited) throw new Error(`MariaDB exited at start (is port ${opts.port} in use?). Its log:\n${tailLog(logFile)}`);
    if (Date.now() > deadline) {
      child.kill("SIGKILL");
      throw new Error(`MariaDB did not accept connections within 60 s. Its log:\n${tailLog(logFile)}`);
    }
    await sleep(250);
  }
  log(`MariaDB ready on 127.0.0.1:${opts.port} (data ${datadir})`);
  createDatabaseAndUser(socket, opts);

  return {
    socket,
    process: child,
    stop: async () => {
      stopBySocket(socket);
      const until = Date.now() + 30_000;
      while (!exited && Date.now() < until) await sleep(100);
      if (!exited) child.kill("SIGKILL");
    },
  };
}

function stopBySocket(socket: string): void {
  admin(socket, ["shutdown"]);
}

function userName(): string {
  const r = spawnSync("id", ["-un"], { encoding: "utf8" });
  return r.stdout.trim() || "root";
}

function quote(value: string): string {
  return `'${value.replace(/\\/g, "\\\\").replace(/'/g, "\\'")}'`;
}

export function createDatabaseAndUser(socket: string, opts: MariaDbOptions): void {
  const db = opts.database;
  sql(
    socket,
    [
      `CREATE DATABASE IF NOT EXISTS \`${db}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`,
      `CREATE USER IF NOT EXISTS ${quote(opts.user)}@'127.0.0.1' IDENTIFIED BY ${quote(opts.password)};`,
      `ALTER USER ${quote(opts.user)}@'127.0.0.1' IDENTIFIED BY ${quote(opts.password)};`,
      `GRANT ALL PRIVILEGES ON \`${db}\`.* TO ${quote(opts.user)}@'127.0.0.1';`,
      "FLUSH PRIVILEGES;",
    ].join(" "),
  );
}

export function dropDatabase(socket: string, database: string): void {
  sql(socket, `DROP DATABASE IF EXISTS \`${database}\`;`);
}
