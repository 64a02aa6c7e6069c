/** Writes docs/routes.md: every page and API route with the roles that may use it (from the code). */
import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { ROOT } from "./lib/stack.ts";
import { buildRouteTable, renderRouteTable } from "./lib/route-table.ts";

const table = buildRouteTable(ROOT);
const doc = `# Routes and who may use them

Generated from the code by \`node --import tsx scripts/route-table.ts\` (do not edit by hand; a test
checks that this file matches the code). "public" needs no session; "signed-in" needs any session;
otherwise the permission in \`src/lib/permissions.ts\` decides. A member of another organisation
gets 404 for that organisation's records.

${renderRouteTable(table)}
`;
writeFileSync(join(ROOT, "docs", "routes.md"), doc);
console.log(`docs/routes.md: ${table.length} routes`);
