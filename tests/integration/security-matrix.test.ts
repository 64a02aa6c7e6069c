import { beforeAll, beforeEach, describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { ApiClient, DEMO, signedIn } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { buildRouteTable, renderRouteTable, type RouteEntry } from "../../scripts/lib/route-table.ts";
import { ROLES, type Role } from "../../src/lib/permissions.ts";

const ROOT = join(import.meta.dirname, "../..");
const table = buildRouteTable(ROOT);
const EMAIL: Record<Role, string> = {
  owner: DEMO.owner,
  manager: DEMO.manager,
  crew_chief: DEMO.chief,
  mechanic: DEMO.mechanic,
  viewer: DEMO.viewer,
};

/** Which table the first dynamic segment of a path points into. */
const TABLE_OF: [RegExp, string, string][] = [
  [/^\/api\/v1\/engines\/\[id\]|^\/motors\/\[id\]/, "engines", "id"],
  [/^\/api\/v1\/chassis\/\[id\]/, "chassis", "id"],
  [/^\/api\/v1\/parts\/\[id\]/, "parts", "id"],
  [/^\/api\/v1\/reading-sets\/\[id\]/, "reading_sets", "id"],
  [/^\/api\/v1\/usage\/\[id\]/, "usage_entries", "id"],
  [/^\/api\/v1\/uploads\/\[id\]/, "uploads", "id"],
  [/^\/api\/v1\/racing-classes\/\[id\]/, "racing_classes", "id"],
  [/^\/api\/v1\/events\/\[id\]/, "events", "id"],
  [/^\/api\/v1\/jobs\/\[id\]/, "jobs", "id"],
  [/^\/api\/v1\/signals\/\[id\]/, "signals", "id"],
];

let orgIds: { kestrel: number; larch: number };
const clients = new Map<Role, ApiClient>();
let outsider: ApiClient; // a Larchwind owner

async function idIn(tableName: string, organisationId: number): Promise<number | null> {
  const row = await testDb()(tableName).where({ organisation_id: organisationId }).orderBy("id").first("id");
  return row ? Number(row.id) : null;
}

async function concretePath(e: RouteEntry, organisationId: number): Promise<string> {
  let path = e.path;
  for (const [re, tableName] of TABLE_OF) {
    if (re.test(path)) {
      const id = await idIn(tableName, organisationId);
      path = path.replace("[id]", String(id ?? 999999999));
    }
  }
  return path.replace(/\[[^\]]+\]/g, "999999999");
}

function call(c: ApiClient, e: RouteEntry, path: string) {
  const method = e.method === "PAGE" ? "GET" : e.method;
  return method === "GET" || method === "DELETE" ? c.request(method, path) : c.request(method, path, {});
}

beforeAll(async () => {
  await clearSignInAttempts();
  const orgs = await testDb()("organisations").whereIn("slug", ["kestrel-hollow", "larchwind-trail"]).select("id", "slug");
  orgIds = {
    kestrel: Number(orgs.find((o) => o.slug === "kestrel-hollow")!.id),
    larch: Number(orgs.find((o) => o.slug === "larchwind-trail")!.id),
  };
  for (const role of ROLES) clients.set(role, await signedIn(EMAIL[role]));
  outsider = await signedIn(DEMO.otherOwner);
});
beforeEach(async () => {
  await clearSignInAttempts();
});

describe("the route table", () => {
  it("covers every page and API route, and docs/routes.md matches the code", () => {
    expect(table.length).toBeGreaterThan(30);
    const doc = readFileSync(join(ROOT, "docs/routes.md"), "utf8");
    expect(doc).toContain(renderRouteTable(table));
  });
});

// The 403 page itself answers 403 to everyone.
const guarded = table.filter((e) => e.access !== "public" && e.path !== "/forbidden");

describe("every guarded route", () => {
  it.each(guarded.map((e) => [`${e.method} ${e.path}`, e] as const))("%s: 401 or sign-in for anonymous", async (_name, e) => {
    const res = await call(new ApiClient(), e, await concretePath(e, orgIds.kestrel));
    if (e.path.startsWith("/api/")) {
      expect(res.status).toBe(401);
      expect(res.body.error.code).toBe("unauthorized");
    } else {
      expect(res.status).toBe(303);
      expect(res.headers.get("location")).toMatch(/^\/sign-in/);
    }
  });

  it.each(guarded.map((e) => [`${e.method} ${e.path}`, e] as const))("%s: 403 for the roles it does not allow, never 401/403/500 for those it does", async (_name, e) => {
    // Reads use a real record of the demo organisation; writes use an id that does not exist, so
    // this sweep never changes the demo data that other tests read.
    const isRead = e.method === "GET" || e.method === "PAGE";
    const path = isRead ? await concretePath(e, orgIds.kestrel) : e.path.replace(/\[[^\]]+\]/g, "999999999");
    for (const role of ROLES) {
      const allowed = e.roles === "any signed-in person" || (Array.isArray(e.roles) && e.roles.includes(role));
      const res = await call(clients.get(role)!, e, path);
      if (allowed) {
        expect([401, 403, 500, 502, 503], `${role} ${e.method} ${path} -> ${res.status}`).not.toContain(res.status);
        if ((e.method === "GET" || e.method === "PAGE") && !path.includes("999999999")) {
          // 400: a read that needs query parameters (the atmosphere at an elevation).
          expect([200, 302, 303, 400], `${role} GET ${path}`).toContain(res.status);
        }
      } else {
        expect(res.status, `${role} ${e.method} ${path}`).toBe(403);
      }
    }
  });
});

const scoped = guarded.filter((e) => TABLE_OF.some(([re]) => re.test(e.path)));

describe("another organisation's records", () => {
  it.each(scoped.map((e) => [`${e.method} ${e.path}`, e] as const))("%s: 404 (or refused) for a member of another organisation, nothing changed", async (_name, e) => {
    const path = await concretePath(e, orgIds.kestrel);
    if (path.includes("999999999")) return; // no record of that kind in the demo organisation
    const tableName = TABLE_OF.find(([re]) => re.test(e.path))![1];
    const [[before]] = await testDb().raw("CHECKSUM TABLE ??", [tableName]);
    const res = await call(outsider, e, path);
    if (e.method === "GET" || e.method === "PAGE" || e.method === "DELETE") expect(res.status, `${e.method} ${path}`).toBe(404);
    else expect([400, 404, 409, 415], `${e.method} ${path} -> ${res.status}`).toContain(res.status);
    const [[after]] = await testDb().raw("CHECKSUM TABLE ??", [tableName]);
    expect(after.Checksum).toBe(before.Checksum);
  });
});
