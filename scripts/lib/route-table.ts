/**
 * The table of every page and API route with who may use it, read from the code itself: a
 * `defineApi({ permission })` per method for API routes, `requirePermission(Astro.locals, "…")`
 * for pages, and an `// access: …` line for the few routes that use neither.
 */
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { PERMISSIONS, ROLES, type Permission, type Role } from "../../src/lib/permissions.ts";

export interface RouteEntry {
  file: string;
  path: string; // e.g. /api/v1/engines/[id]
  method: string; // GET, POST… ("PAGE" for a page's GET)
  access: Permission | "public" | "signed-in";
  roles: Role[] | "anyone" | "any signed-in person";
}

function walk(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir).sort()) {
    const full = join(dir, name);
    if (statSync(full).isDirectory()) out.push(...walk(full));
    else if (/\.(ts|astro)$/.test(name)) out.push(full);
  }
  return out;
}

function routePath(pagesDir: string, file: string): string {
  let p = "/" + relative(pagesDir, file).replace(/\\/g, "/").replace(/\.(ts|astro)$/, "");
  p = p.replace(/\/index$/, "") || "/";
  return p;
}

function rolesFor(access: RouteEntry["access"]): RouteEntry["roles"] {
  if (access === "public") return "anyone";
  if (access === "signed-in") return "any signed-in person";
  return [...(PERMISSIONS[access] as readonly Role[])];
}

function parseAccess(value: string, file: string): RouteEntry["access"] {
  if (value === "public" || value === "signed-in" || value in PERMISSIONS) return value as RouteEntry["access"];
  throw new Error(`${file}: unknown access "${value}"`);
}

export function buildRouteTable(root: string): RouteEntry[] {
  const pagesDir = join(root, "src", "pages");
  const entries: RouteEntry[] = [];
  for (const file of walk(pagesDir)) {
    const src = readFileSync(file, "utf8");
    const rel = relative(root, file);
    const path = routePath(pagesDir, file);
    const apiRe = /export const (GET|POST|PATCH|PUT|DELETE) = defineApi\(\{[\s\S]*?permission:\s*"([^"]+)"/g;
    let m: RegExpExecArray | null;
    let found = false;
    const viaDefineApi = new Set<string>();
    while ((m = apiRe.exec(src))) {
      found = true;
      viaDefineApi.add(m[1]);
      const access = parseAccess(m[2], rel);
      entries.push({ file: rel, path, method: m[1], access, roles: rolesFor(access) });
    }
    if (found) {
      // A method of the same file written by hand (the multipart upload) is listed too: by the
      // permission its own body requires, else the file's "// access:" line.
      for (const hand of src.matchAll(/export const (GET|POST|PATCH|PUT|DELETE)\b(?!\s*=\s*defineApi)[\s\S]*?(?=\nexport |$)/g)) {
        if (viaDefineApi.has(hand[1])) continue;
        const perm = /requirePermission\(context\.locals,\s*"([^"]+)"\)/.exec(hand[0])?.[1] ?? /\/\/\s*access:\s*([a-z:-]+)/.exec(src)?.[1];
        if (!perm) throw new Error(`${rel}: ${hand[1]} is not a defineApi route; it needs requirePermission or an "// access: …" line`);
        const access = parseAccess(perm, rel);
        entries.push({ file: rel, path, method: hand[1], access, roles: rolesFor(access) });
      }
      continue;
    }
    const marker = /\/\/\s*access:\s*([a-z:-]+)/.exec(src);
    const methods = [...src.matchAll(/export const (GET|POST|PATCH|PUT|DELETE)\b/g)].map((x) => x[1]);
    if (file.endsWith(".astro")) {
      const perm = /requirePermission\(Astro\.locals,\s*"([^"]+)"\)/.exec(src)?.[1];
      const access = parseAccess(perm ?? marker?.[1] ?? "", rel);
      entries.push({ file: rel, path, method: "PAGE", access, roles: rolesFor(access) });
      continue;
    }
    if (!marker) throw new Error(`${rel}: a route without defineApi needs an "// access: …" line`);
    const access = parseAccess(marker[1], rel);
    for (const method of methods.length ? methods : ["GET"]) entries.push({ file: rel, path, method, access, roles: rolesFor(access) });
  }
  return entries;
}

export function renderRouteTable(entries: RouteEntry[]): string {
  const head = ["| path | method | access | " + ROLES.join(" | ") + " |", "| --- | --- | --- | " + ROLES.map(() => "---").join(" | ") + " |"];
  const rows = entries.map((e) => {
    const cells = ROLES.map((r) => (e.roles === "anyone" || e.roles === "any signed-in person" || e.roles.includes(r) ? "yes" : "—"));
    return `| \`${e.path}\` | ${e.method} | ${e.access} | ${cells.join(" | ")} |`;
  });
  return [...head, ...rows].join("\n");
}
