// `npm test`: dependencies, then the whole suite against its own MariaDB and fakes.
import { ensureDependencies, handOver } from "./bootstrap.mjs";

ensureDependencies();
handOver("scripts/test.ts", process.argv.slice(2));
