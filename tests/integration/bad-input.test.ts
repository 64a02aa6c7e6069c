import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { join } from "node:path";
import type { ZodType } from "zod";
import { BASE_URL, DEMO, signedIn, type ApiClient } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { buildRouteTable, type RouteEntry } from "../../scripts/lib/route-table.ts";
import {
  bodyArbitrary,
  changedTables,
  checksumAll,
  expectWellFormed,
  fieldNamesOf,
  parseLikeServer,
  queryArbitrary,
  schemaOfRoute,
  send,
  sentSoFar,
  toJsonText,
} from "./bad-input-support.ts";

// Malformed bodies against every write route, and malformed query strings against every API read
// (the calculation routes among them) and DELETE, in the demo organisation, signed in as its owner: each must be refused with a 4xx in the one error shape,
// carry no NaN/Infinity, and leave every table as it was. A body the route's own schema would
// accept is never sent here (it could change the demo data); those run in bad-input-edges.

const ROOT = join(import.meta.dirname, "../..");
const SEED = 20261207;
const RUNS = 20;
const WRITE = new Set(["POST", "PATCH", "PUT", "DELETE"]);
const table = buildRouteTable(ROOT);
const apiWrites = table.filter((e) => e.path.startsWith("/api/") && WRITE.has(e.method));
// Reads take their input from the query string: every API read is swept too (calculations first of all).
const apiReads = table.filter((e) => e.path.startsWith("/api/") && e.method === "GET");

interface Target {
  entry: RouteEntry;
  schema: ZodType | null;
  path: string;
  client: ApiClient | null;
}

/** The owner may use every route; a route the owner may not use is called as its mechanic. */
function clientFor(e: RouteEntry, owner: ApiClient, mechanic: ApiClient): ApiClient | null {
  if (e.access === "public") return null;
  if (e.roles === "any signed-in person" || e.roles === "anyone" || e.roles.includes("owner")) return owner;
  return e.roles.includes("mechanic") ? mechanic : owner;
}

async function firstId(tableName: string, where: Record<string, unknown>): Promise<string | null> {
  const row = await testDb()(tableName).where(where).orderBy("id").first("id");
  return row ? String(row.id) : null;
}

/** The path with the demo organisation's own records in its dynamic segments. */
async function demoPath(path: string, orgId: number): Promise<string> {
  const k = testDb();
  if (path.includes("[serviceId]")) {
    const s = await k("services").where({ organisation_id: orgId }).orderBy("id").first("id", "engine_id");
    return path.replace("[id]", String(s?.engine_id ?? 999999999)).replace("[serviceId]", String(s?.id ?? 999999999));
  }
  if (path.includes("[entryId]")) {
    const en = await k("event_entries as ee").join("events as ev", "ev.id", "ee.event_id").where("ev.organisation_id", orgId).orderBy("ee.id").first("ee.id", "ee.event_id");
    return path.replace("[id]", String(en?.event_id ?? 999999999)).replace("[entryId]", String(en?.id ?? 999999999));
  }
  if (path.includes("[userId]")) {
    const m = await k("memberships").where({ organisation_id: orgId, role: "viewer" }).orderBy("user_id").first("user_id");
    return path.replace("[userId]", m?.user_id ?? "nobody");
  }
  const tables: [string, string][] = [
    ["/engines/", "engines"], ["/chassis/", "chassis"], ["/parts/", "parts"], ["/reading-sets/", "reading_sets"],
    ["/usage/", "usage_entries"], ["/uploads/", "uploads"], ["/racing-classes/", "racing_classes"], ["/events/", "events"],
    ["/jobs/", "jobs"], ["/signals/", "signals"], ["/crew/invitations/", "invitations"],
  ];
  const hit = tables.find(([segment]) => path.includes(`${segment}[id]`));
  if (!hit) return path;
  return path.replace("[id]", (await firstId(hit[1], { organisation_id: orgId })) ?? "999999999");
}

let owner: ApiClient;
let targets: Target[] = [];
let startSums: Map<string, string>;

beforeAll(async () => {
  await clearSignInAttempts();
  const org = await testDb()("organisations").where({ slug: "kestrel-hollow" }).first("id");
  owner = await signedIn(DEMO.owner);
  const mechanic = await signedIn(DEMO.mechanic);
  for (const entry of [...apiWrites, ...apiReads]) {
    targets.push({ entry, schema: await schemaOfRoute(ROOT, entry), path: await demoPath(entry.path, Number(org.id)), client: clientFor(entry, owner, mechanic) });
  }
  startSums = await checksumAll(testDb());
});

const startedAt = Date.now();
afterAll(async () => {
  await clearSignInAttempts();
  const t = sentSoFar();
  console.info(`bad input: ${t.sent} requests to ${apiWrites.length} write and ${apiReads.length} read routes, ${t.refused} refused with a 4xx, in ${((Date.now() - startedAt) / 1000).toFixed(1)} s`);
});

function cookieOf(t: Target): string {
  return t.client?.cookieHeader() ?? "";
}

/** Sends one generated input; true when the schema would have accepted it (nothing is sent then). */
async function sendRefused(t: Target, text: string | null, query: Record<string, string> | null): Promise<boolean> {
  const method = t.entry.method;
  if (t.schema) {
    const parsed = query ?? parseLikeServer(text ?? "");
    if (parsed !== undefined && t.schema.safeParse(parsed).success) return true;
  }
  const qs = query ? `?${new URLSearchParams(query)}` : "";
  const a = await send(BASE_URL, cookieOf(t), method, t.path + qs, text ?? undefined);
  const what = `${method} ${t.path}${qs.slice(0, 120)} ${text === null ? "" : text.slice(0, 160)}`;
  expectWellFormed(a, what);
  expect(a.status, `${what} was accepted`).toBeGreaterThanOrEqual(400);
  return false;
}

const bodyTargets = (): Target[] => targets.filter((t) => t.schema && t.entry.method !== "GET" && t.entry.method !== "DELETE");

describe("malformed bodies and queries, as the demo organisation's owner", () => {
  const bodyRoutes = apiWrites.filter((e) => e.method !== "DELETE").map((e) => `${e.method} ${e.path}`);
  it.each(bodyRoutes)("%s: every malformed body is refused, in the error shape, changing nothing", async (name) => {
    const t = targets.find((x) => `${x.entry.method} ${x.entry.path}` === name)!;
    if (!t.schema) return; // takes no body at all: see bad-input-edges
    const before = await checksumAll(testDb());
    let skipped = 0;
    await fc.assert(
      fc.asyncProperty(bodyArbitrary(fieldNamesOf(t.schema)), async (body) => {
        if (await sendRefused(t, toJsonText(body), null)) skipped += 1;
      }),
      { numRuns: RUNS, seed: SEED, endOnFailure: true },
    );
    for (const empty of ["", "{}", "null", "[]"]) await sendRefused(t, empty, null);
    expect(skipped, `${name}: too few generated bodies were malformed`).toBeLessThan(RUNS / 2);
    expect(changedTables(before, await checksumAll(testDb())), `${name} changed rows`).toEqual([]);
  });

  const queryRoutes = [...apiWrites.filter((e) => e.method === "DELETE"), ...apiReads].map((e) => `${e.method} ${e.path}`);
  it.each(queryRoutes)("%s: every malformed query is refused, changing nothing", async (name) => {
    const t = targets.find((x) => `${x.entry.method} ${x.entry.path}` === name)!;
    if (!t.schema) return; // reads nothing from the request: see bad-input-edges
    const before = await checksumAll(testDb());
    await fc.assert(
      fc.asyncProperty(queryArbitrary(fieldNamesOf(t.schema)), async (query) => {
        await sendRefused(t, null, query);
      }),
      { numRuns: RUNS, seed: SEED, endOnFailure: true },
    );
    expect(changedTables(before, await checksumAll(testDb())), `${name} changed rows`).toEqual([]);
  });
});

describe("the request envelope", () => {
  it("refuses a form-encoded body to every JSON write route with 415", async () => {
    for (const t of bodyTargets()) {
      const a = await send(BASE_URL, cookieOf(t), t.entry.method, t.path, "name=x&engineId=1", "application/x-www-form-urlencoded");
      expectWellFormed(a, `${t.entry.method} ${t.path} form`);
      expect(a.status, `${t.entry.method} ${t.path}`).toBe(415);
      const plain = await send(BASE_URL, cookieOf(t), t.entry.method, t.path, "{}", "text/plain");
      expect(plain.status, `${t.entry.method} ${t.path} text/plain`).toBe(415);
    }
  });

  it("refuses a body over 2 MB with 413, counted in bytes, whether or not its length is declared", async () => {
    for (const t of bodyTargets()) {
      const ascii = await send(BASE_URL, cookieOf(t), t.entry.method, t.path, JSON.stringify({ notes: "x".repeat(2 * 1024 * 1024) }));
      expectWellFormed(ascii, `${t.entry.method} ${t.path} 2 MB`);
      expect(ascii.status, `${t.entry.method} ${t.path} 2 MB`).toBe(413);
    }
    const t = bodyTargets().find((x) => x.entry.path === "/api/v1/usage")!;
    // 1.2 million two-byte characters: under 2 MB in characters, 2.4 MB on the wire.
    const wide = await send(BASE_URL, cookieOf(t), "POST", t.path, JSON.stringify({ notes: "é".repeat(1_200_000) }));
    expect(wide.status).toBe(413);
    const chunks = new ReadableStream<Uint8Array>({
      start(controller) {
        for (let i = 0; i < 40; i += 1) controller.enqueue(new TextEncoder().encode("x".repeat(64 * 1024)));
        controller.close();
      },
    });
    const res = await fetch(BASE_URL + t.path, {
      method: "POST",
      headers: { "content-type": "application/json", cookie: cookieOf(t), origin: new URL(BASE_URL).origin },
      body: chunks,
      duplex: "half",
    } as RequestInit);
    expect(res.status).toBe(413);
    expect((await res.json()).error.code).toBe("too_large");
    // 20 MB: the server stops reading at once, and still answers 413.
    const huge = await send(BASE_URL, cookieOf(t), "POST", t.path, JSON.stringify({ notes: "x".repeat(20 * 1024 * 1024) }));
    expect(huge.status).toBe(413);
    // The connection after a refused body serves the next request as usual.
    for (let i = 0; i < 3; i += 1) expect((await send(BASE_URL, cookieOf(t), "POST", t.path, "{}")).status).toBe(400);
  });

  it("answers 400 naming the body for JSON that does not parse", async () => {
    for (const t of bodyTargets()) {
      const a = await send(BASE_URL, cookieOf(t), t.entry.method, t.path, '{"engineId": 1,');
      expectWellFormed(a, `${t.entry.method} ${t.path} broken JSON`);
      expect(a.status).toBe(400);
      expect(JSON.parse(a.text).error.fields.body, `${t.entry.method} ${t.path}`).toBeTruthy();
    }
  });

  it("refuses malformed ids in the path with 404 (or 400 for the body), changing nothing", async () => {
    const before = await checksumAll(testDb());
    const ids = ["0", "-1", "-0", "1e3", "1.0", "NaN", "Infinity", "0x1", "%20", "%EF%BC%91", "9".repeat(30), "1%3BDROP", "%00", "..%2F1"];
    for (const t of targets.filter((x) => x.entry.path.includes("["))) {
      for (const bad of ids) {
        const path = t.entry.path.replace(/\[[^\]]+\]/g, bad);
        const a = await send(BASE_URL, cookieOf(t), t.entry.method, path, t.entry.method === "DELETE" || t.entry.method === "GET" ? undefined : "{}");
        expectWellFormed(a, `${t.entry.method} ${path}`);
        expect([400, 404], `${t.entry.method} ${path}`).toContain(a.status);
      }
    }
    expect(changedTables(before, await checksumAll(testDb()))).toEqual([]);
  });

  it("left every table as it was over the whole run", async () => {
    expect(changedTables(startSums, await checksumAll(testDb()))).toEqual([]);
  });
});
