import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { join } from "node:path";
import { BASE_URL } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { buildRouteTable, type RouteEntry } from "../../scripts/lib/route-table.ts";
import { Raw, changedTables, checksumAll, expectWellFormed, schemaOfRoute, send, sentSoFar, toJsonText, wildValue } from "./bad-input-support.ts";
import { createTeam, teamPath, templates, type Team } from "./bad-input-templates.ts";

// The other half of the bad-input sweep, in a throw-away organisation: a valid body per write
// route, changed one field at a time. A field of the wrong JSON type is always refused (400) and
// writes nothing; any other strange value may be accepted, but never breaks a route (no 5xx,
// no NaN) and, when refused, writes nothing either.

const ROOT = join(import.meta.dirname, "../..");
const SEED = 20261207;
const RUNS = 15;
const table = buildRouteTable(ROOT);
const key = (e: RouteEntry): string => `${e.method} ${e.path}`;
const ANONYMOUS = new Set(["POST /api/auth/sign-in", "POST /api/auth/reset-request", "POST /api/auth/reset", "POST /api/auth/accept-invitation", "POST /api/auth/sign-out"]);

type Path = (string | number)[];

function nodes(v: unknown, at: Path = []): { path: Path; value: unknown }[] {
  const out: { path: Path; value: unknown }[] = at.length ? [{ path: at, value: v }] : [];
  if (Array.isArray(v)) v.forEach((x, i) => out.push(...nodes(x, [...at, i])));
  else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) out.push(...nodes(x, [...at, k]));
  return out;
}

function setAt(root: unknown, path: Path, value: unknown): unknown {
  const copy = JSON.parse(JSON.stringify(root)) as Record<string | number, unknown>;
  let at = copy;
  for (const step of path.slice(0, -1)) at = at[step] as Record<string | number, unknown>;
  at[path[path.length - 1]] = value;
  return copy;
}

/** Values of another JSON type than the one the template holds. */
function wrongTypes(v: unknown): unknown[] {
  if (typeof v === "number") return [true, String(v), [v], {}];
  if (typeof v === "string") return [5, true, [v], {}];
  if (typeof v === "boolean") return ["true", 1, [v]];
  if (Array.isArray(v)) return [{}, "x", 5];
  if (v && typeof v === "object") return ["x", 5, [v]];
  return [];
}

/** Values near the limits that a route may well accept: they must still never break it. */
const edgeButPlausible = fc.constantFrom<unknown>(
  new Raw("-0"),
  0,
  5e-324,
  1e-7,
  0.1 + 0.2,
  9_999_999,
  1e15,
  Number.MAX_SAFE_INTEGER,
  "😀".repeat(30),
  "e\u0301".repeat(20),
  " padded ",
  "\ud800",
  "0001-01-01",
  "1000-01-01",
  "9999-12-31",
  "2024-02-29",
  "0001-01-01T00:00:00Z",
  "2026-06-01T00:00:00+14:00",
  "2026-06-01T23:59:59.999999999Z",
  null,
  [],
  {},
);

let team: Team;
let bodies: Record<string, unknown>;
const accepted: Record<string, number> = {};

beforeAll(async () => {
  await clearSignInAttempts();
  team = await createTeam();
  bodies = templates(team.orgId, team.ids);
});

const startedAt = Date.now();
afterAll(async () => {
  await clearSignInAttempts();
  const t = sentSoFar();
  const total = Object.values(accepted).reduce((a, b) => a + b, 0);
  console.info(`bad input edges: ${t.sent} requests, ${t.refused} refused with a 4xx, ${total} changed bodies accepted, in ${((Date.now() - startedAt) / 1000).toFixed(1)} s`);
});

function cookieFor(name: string): string {
  return ANONYMOUS.has(name) ? "" : team.owner.cookieHeader();
}

async function sendTo(name: string, body: unknown): Promise<ReturnType<typeof send>> {
  const [method, path] = name.split(" ");
  return send(BASE_URL, cookieFor(name), method, teamPath(path, team.ids), body === undefined ? undefined : toJsonText(body));
}

const bodyRoutes = table.filter((e) => e.path.startsWith("/api/") && (e.method === "POST" || e.method === "PATCH" || e.method === "PUT"));

describe("every write route with a body has a valid body here", () => {
  it("names a template for each route that parses a JSON body", async () => {
    const missing: string[] = [];
    for (const e of bodyRoutes) if ((await schemaOfRoute(ROOT, e)) && !(key(e) in bodies)) missing.push(key(e));
    expect(missing).toEqual([]);
  });

  it("the templates themselves pass the routes' schemas", async () => {
    for (const e of bodyRoutes) {
      const schema = await schemaOfRoute(ROOT, e);
      if (!schema || !(key(e) in bodies)) continue;
      const r = schema.safeParse(bodies[key(e)]);
      expect(r.success, `${key(e)}: ${JSON.stringify(r.error?.issues)}`).toBe(true);
    }
  });
});

describe("a field of the wrong JSON type", () => {
  it.each(Object.keys(templates(1, {})))("%s: refused with 400 naming it, nothing written", async (name) => {
    const before = await checksumAll(testDb());
    for (const { path, value } of nodes(bodies[name])) {
      for (const wrong of wrongTypes(value)) {
        const a = await sendTo(name, setAt(bodies[name], path, wrong));
        const what = `${name} ${path.join(".")} = ${JSON.stringify(wrong)}`;
        expectWellFormed(a, what);
        expect(a.status, `${what}: ${a.text.slice(0, 200)}`).toBe(400);
        const fields = Object.keys(JSON.parse(a.text).error.fields ?? {});
        expect(fields.some((f) => f === String(path[0]) || f.startsWith(`${path[0]}.`)), `${what} names ${path[0]}: ${fields}`).toBe(true);
      }
    }
    await clearSignInAttempts();
    expect(changedTables(before, await checksumAll(testDb())), `${name} wrote rows`).toEqual([]);
  });
});

describe("a field at the edge of its range, or beyond it", () => {
  it.each(Object.keys(templates(1, {})))("%s: never a 5xx, never NaN, and nothing written when refused", async (name) => {
    const template = bodies[name];
    const paths = nodes(template).map((n) => n.path);
    const mutation = fc.tuple(
      fc.oneof({ weight: 8, arbitrary: fc.constantFrom(...paths) }, { weight: 1, arbitrary: fc.constant(["zzUnknown"] as Path) }),
      fc.oneof({ weight: 3, arbitrary: edgeButPlausible }, { weight: 2, arbitrary: wildValue }),
    );
    let sums = await checksumAll(testDb());
    await fc.assert(
      fc.asyncProperty(mutation, async ([path, value]) => {
        const body = placeAt(JSON.parse(JSON.stringify(template)) as Record<string, unknown>, path, value);
        const a = await sendTo(name, body);
        const what = `${name} ${path.join(".")} = ${toJsonText(value).slice(0, 80)}`;
        expectWellFormed(a, what);
        const after = await checksumAll(testDb());
        if (a.status >= 400) expect(changedTables(sums, after), `${what} answered ${a.status} but wrote rows`).toEqual([]);
        else accepted[name] = (accepted[name] ?? 0) + 1;
        sums = after;
      }),
      { numRuns: RUNS, seed: SEED, endOnFailure: true },
    );
    await clearSignInAttempts();
  });
});

/** The body with `value` (which may be a Raw token) placed at `path`. */
function placeAt(root: Record<string, unknown>, path: Path, value: unknown): unknown {
  let at: Record<string | number, unknown> = root;
  for (const step of path.slice(0, -1)) at = at[step] as Record<string | number, unknown>;
  at[path[path.length - 1]] = value;
  return root;
}

describe("the multipart upload", () => {
  const PDF = "%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n";
  const text = fc.oneof(
    fc.constantFrom("", " ", "NaN", "-0", "0", "1e309", "Infinity", "0x10", "1.5", "9".repeat(30), "１", "25", "-1", "null", "[]"),
    fc.string({ unit: "binary", maxLength: 12 }),
  );

  it("refuses malformed forms with a 4xx in shape, writing no row", async () => {
    const before = await checksumAll(testDb());
    const url = `${BASE_URL}/api/v1/uploads`;
    const headers = { origin: new URL(BASE_URL).origin, cookie: team.owner.cookieHeader() };
    await fc.assert(
      // The cylinder is never a valid one, so whatever the engine id, the form must be refused.
      fc.asyncProperty(text, fc.constantFrom("0", "-0", "-1", "NaN", "25", "1.5", "1e309", "Infinity", "abc"), fc.boolean(), async (engineId, cylinderNo, bigCaption) => {
        const form = new FormData();
        form.append("engineId", engineId);
        form.append("cylinderNo", cylinderNo);
        form.append("caption", bigCaption ? "x".repeat(1024 * 1024) : "crown");
        form.append("file", new Blob([PDF], { type: "application/pdf" }), "scan.pdf");
        const res = await fetch(url, { method: "POST", headers, body: form });
        const a = { status: res.status, type: res.headers.get("content-type") ?? "", text: await res.text() };
        expectWellFormed(a, `upload engineId=${JSON.stringify(engineId)} cylinderNo=${JSON.stringify(cylinderNo)}`);
        expect(a.status).toBeGreaterThanOrEqual(400);
      }),
      { numRuns: RUNS, seed: SEED, endOnFailure: true },
    );
    for (const body of ["--x\r\nnot a form", "", "x".repeat(1000)]) {
      const res = await fetch(url, { method: "POST", headers: { ...headers, "content-type": "multipart/form-data; boundary=x" }, body });
      const a = { status: res.status, type: res.headers.get("content-type") ?? "", text: await res.text() };
      expectWellFormed(a, `upload body ${body.slice(0, 20)}`);
      expect(a.status).toBe(400);
    }
    expect(changedTables(before, await checksumAll(testDb()))).toEqual([]);
  });
});

describe("routes that read no body", () => {
  const bodiless = table.filter((e) => e.path.startsWith("/api/") && (e.method === "DELETE" || e.method === "POST"));
  it("ignore whatever body comes with them and still answer in shape", async () => {
    for (const e of bodiless) {
      const schema = await schemaOfRoute(ROOT, e);
      if (schema || e.access === "public") continue;
      for (const body of [new Raw('{"a":'.repeat(50) + "1" + "}".repeat(50)), "x".repeat(1024 * 1024), [null], new Raw("NaN")]) {
        const a = await sendTo(key(e), body);
        expectWellFormed(a, `${key(e)} with ${toJsonText(body).slice(0, 40)}`);
      }
    }
  });

  it("routes whose every field is optional take an empty body in shape", async () => {
    for (const e of bodyRoutes) {
      const schema = await schemaOfRoute(ROOT, e);
      if (!schema || !schema.safeParse({}).success) continue;
      for (const empty of ["", "{}"]) {
        const [method, path] = key(e).split(" ");
        const a = await send(BASE_URL, cookieFor(key(e)), method, teamPath(path, team.ids), empty);
        expectWellFormed(a, `${key(e)} with "${empty}"`);
      }
    }
  });
});
