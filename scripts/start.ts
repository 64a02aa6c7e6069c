/** `npm start`: the whole product with demo data on http://localhost:PORT. Ctrl-C stops it all. */
import { join } from "node:path";
import { SERVER_ENTRY, buildIfStale, log, migrate, ROOT, seed, startBackingServices } from "./lib/stack.ts";
import { httpOk, isPortOpen, startChild, waitFor } from "./lib/processes.ts";

const num = (name: string, fallback: number): number => Number(process.env[name] ?? fallback);
const started = Date.now();

const cfg = {
  dataDir: process.env.DATA_DIR ?? join(ROOT, ".data"),
  dbPort: num("DB_PORT", 3407),
  dbName: process.env.DB_NAME ?? "ringland",
  dbUser: process.env.DB_USER ?? "ringland",
  dbPassword: process.env.DB_PASSWORD ?? "ringland-local-dev",
  smtpPort: num("SMTP_PORT", 2525),
  mailInboxPort: num("MAIL_INBOX_PORT", 8025),
  s3Port: num("S3_PORT", 4569),
  webPort: num("PORT", 4321),
};

async function main(): Promise<void> {
  if (await isPortOpen(cfg.webPort)) {
    throw new Error(`port ${cfg.webPort} is already in use (another Ringland?). Stop it or set PORT.`);
  }
  const stack = await startBackingServices(cfg);
  let stopping = false;
  const shutdown = async (code: number): Promise<void> => {
    if (stopping) return;
    stopping = true;
    log("stopping…");
    await stack.stopAll();
    log("stopped");
    process.exit(code);
  };
  process.on("SIGINT", () => void shutdown(0));
  process.on("SIGTERM", () => void shutdown(0));
  try {
    migrate(stack.env);
    seed(stack.env);
    buildIfStale(stack.env);
    const runtimeEnv = { ...stack.env, NODE_ENV: "production" };
    const web = startChild("web", [SERVER_ENTRY], runtimeEnv, { cwd: ROOT });
    stack.children.push(web);
    await waitFor("web server", () => httpOk(`http://127.0.0.1:${cfg.webPort}/api/health`), web);
    const job = startChild("signals", ["--import", "tsx", "jobs/runner.ts"], runtimeEnv, { cwd: ROOT });
    stack.children.push(job);
    web.exited.then((c) => {
      if (!stopping) {
        log(`web server exited (${c}); stopping`);
        void shutdown(1);
      }
    });
  } catch (err) {
    console.error(`ringland: ${(err as Error).message}`);
    await shutdown(1);
    return;
  }
  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  console.log(`
  Ringland is running (ready in ${seconds} s).

    Open        http://localhost:${cfg.webPort}/
    Sign in as  owner@ringland.example     (owner)
                manager@ringland.example   (manager)
                chief@ringland.example     (crew chief)
                mechanic@ringland.example  (mechanic)
                viewer@ringland.example    (viewer)
    Password    ringland-demo
    Caught mail http://127.0.0.1:${cfg.mailInboxPort}/
    Data        ${cfg.dataDir}  (MariaDB on 127.0.0.1:${cfg.dbPort})

  Press Ctrl-C to stop everything.
`);
}

main().catch(async (err) => {
  console.error(`ringland: ${(err as Error).message}`);
  process.exit(1);
});
