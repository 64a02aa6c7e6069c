// `npm start`: dependencies, MariaDB, fakes, migrations, demo seed, build, server and job.
import { ensureDependencies, handOver, loadDotEnv } from "./bootstrap.mjs";

loadDotEnv();
ensureDependencies();
handOver("scripts/start.ts", process.argv.slice(2));
