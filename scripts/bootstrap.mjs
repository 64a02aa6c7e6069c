// Runs before dependencies exist: installs them when package-lock.json changed, then hands over
// to the TypeScript script named on the command line. Plain JavaScript on purpose.
import { spawnSync } from "node:child_process";
import { existsSync, readFileSync, statSync } from "node:fs";
import { join, resolve } from "node:path";

const root = resolve(import.meta.dirname, "..");

export function ensureDependencies() {
  const lock = join(root, "package-lock.json");
  const installed = join(root, "node_modules", ".package-lock.json");
  const stale =
    !existsSync(installed) ||
    !existsSync(join(root, "node_modules", ".bin", "tsx")) ||
    statSync(lock).mtimeMs > statSync(installed).mtimeMs + 1000 ||
    JSON.stringify(JSON.parse(readFileSync(lock, "utf8")).packages?.[""] ?? {}) === "{}";
  if (!stale) return;
  console.log("ringland: installing dependencies with npm ci (about 40 s)…");
  const r = spawnSync("npm", ["ci", "--no-audit", "--no-fund", "--loglevel=error"], { cwd: root, stdio: "inherit" });
  if (r.status !== 0) {
    console.error("ringland: npm ci failed; see the messages above.");
    process.exit(r.status ?? 1);
  }
}

export function loadDotEnv() {
  const file = join(root, ".env");
  if (existsSync(file)) process.loadEnvFile(file);
}

export function handOver(script, args) {
  const r = spawnSync(process.execPath, ["--import", "tsx", join(root, script), ...args], {
    cwd: root,
    stdio: "inherit",
    env: process.env,
  });
  process.exit(r.status ?? (r.signal ? 1 : 0));
}
