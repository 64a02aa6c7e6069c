/**
 * `npm test`: a fresh MariaDB instance and fresh fakes for this run only, migrations and the demo
 * seed, a build of the app served on a free port, then unit, integration and browser tests.
 * Prints one closing line "tests: N passed, N failed".
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { SERVER_ENTRY, buildIfStale, childEnv, log, migrate, ROOT, seed, startBackingServices, type Stack } from "./lib/stack.ts";
import { freePort, httpOk, startChild, waitFor } from "./lib/processes.ts";

const args = process.argv.slice(2);
const only = args.find((a) => a.startsWith("--only="))?.slice(7); // unit | integration
const filters = args.filter((a) => !a.startsWith("--"));

function ensureChromium(): void {
  if (existsSync("/usr/bin/chromium")) return;
  if (process.getuid?.() !== 0) throw new Error("Chromium is missing. Run as root: apt-get install -y chromium");
  log("installing Debian's chromium for the browser tests (about 60 s)…");
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  for (const a of [["update", "-qq"], ["install", "-y", "-qq", "chromium"]]) {
    const r = spawnSync("apt-get", a, { stdio: "inherit", env });
    if (r.status !== 0) throw new Error(`apt-get ${a.join(" ")} failed`);
  }
}

interface Counts {
  passed: number;
  failed: number;
  skipped: number;
}

function runVitest(config: string, env: NodeJS.ProcessEnv, report: string): Counts {
  const r = spawnSync(
    process.execPath,
    ["node_modules/vitest/vitest.mjs", "run", "--config", config, "--reporter=default", "--reporter=json", `--outputFile.json=${report}`, ...filters],
    { cwd: ROOT, env, stdio: "inherit" },
  );
  const counts: Counts = { passed: 0, failed: r.status === 0 ? 0 : 1, skipped: 0 };
  if (existsSync(report)) {
    const json = JSON.parse(readFileSync(report, "utf8"));
    counts.passed = json.numPassedTests ?? 0;
    counts.failed = Math.max(json.numFailedTests ?? 0, r.status === 0 ? 0 : 1);
    counts.skipped = (json.numPendingTests ?? 0) + (json.numTodoTests ?? 0);
    if (r.status !== 0 && (json.numFailedTests ?? 0) === 0) counts.failed = json.numFailedTestSuites || 1;
  }
  return counts;
}

async function main(): Promise<number> {
  const started = Date.now();
  const work = mkdtempSync(join(tmpdir(), "ringland-test-"));
  const total: Counts = { passed: 0, failed: 0, skipped: 0 };
  const add = (c: Counts): void => {
    total.passed += c.passed;
    total.failed += c.failed;
    total.skipped += c.skipped;
  };

  if (only !== "integration") {
    add(runVitest("vitest.unit.config.ts", { ...process.env, NODE_ENV: "test" }, join(work, "unit.json")));
  }

  let stack: Stack | null = null;
  if (only !== "unit") {
    ensureChromium();
    const cfg = {
      dataDir: work,
      dbPort: await freePort(),
      dbName: "ringland_test",
      dbUser: "ringland_test",
      dbPassword: "ringland-test-password",
      smtpPort: await freePort(),
      mailInboxPort: await freePort(),
      s3Port: await freePort(),
      webPort: await freePort(),
      quiet: true,
    };
    try {
      stack = await startBackingServices(cfg);
      migrate(stack.env);
      seed(stack.env);
      buildIfStale(stack.env);
      const serverEnv = { ...childEnv(cfg, "production") };
      const web = startChild("web", [SERVER_ENTRY], serverEnv, { cwd: ROOT, quiet: true });
      stack.children.push(web);
      await waitFor("web server", () => httpOk(`http://127.0.0.1:${cfg.webPort}/api/health`), web);
      const testEnv: NodeJS.ProcessEnv = {
        ...stack.env,
        NODE_ENV: "test",
        RINGLAND_BASE_URL: `http://localhost:${cfg.webPort}`,
        RINGLAND_MAIL_INBOX_URL: `http://127.0.0.1:${cfg.mailInboxPort}`,
        RINGLAND_TEST_WORK: work,
      };
      add(runVitest("vitest.integration.config.ts", testEnv, join(work, "integration.json")));
    } catch (err) {
      console.error(`ringland: ${(err as Error).message}`);
      total.failed += 1;
    } finally {
      await stack?.stopAll();
      rmSync(work, { recursive: true, force: true });
    }
  }
  log(`suite took ${((Date.now() - started) / 1000).toFixed(0)} s`);
  console.log(`tests: ${total.passed} passed, ${total.failed} failed${total.skipped ? `, ${total.skipped} skipped` : ""}`);
  return total.failed > 0 || total.passed === 0 ? 1 : 0;
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
