// `npm run bench`: speed and capacity figures (never part of `npm test`).
import { ensureDependencies, handOver } from "./bootstrap.mjs";

ensureDependencies();
handOver("scripts/bench.ts", process.argv.slice(2));
