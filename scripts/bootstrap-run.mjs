// Runs a TypeScript script with the checkout's .env loaded: `node scripts/bootstrap-run.mjs <script.ts> [args…]`.
import { ensureDependencies, handOver, loadDotEnv } from "./bootstrap.mjs";

loadDotEnv();
ensureDependencies();
const [script, ...args] = process.argv.slice(2);
handOver(script, args);
