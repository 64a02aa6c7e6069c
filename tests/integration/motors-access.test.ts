import sharp from "sharp";
import { beforeAll, describe, expect, it } from "vitest";
import { ApiClient } from "../support/api.ts";
import { testDb } from "../support/db.ts";
import { createRacingClass, createReadingSet, createPart, logUsage, recordService } from "../factories/motors.ts";
import { chassisIn, createCrew, daysAgo, engineIn, upload, type Crew } from "./motors-fixtures.ts";

// Every motors route, three ways: without a session (401), as a viewer on every write (403),
// and from another organisation on every route that names one of our records (404).

let crew: Crew;
let other: Crew;
const ids: Record<string, number> = {};

beforeAll(async () => {
  crew = await createCrew();
  other = await createCrew();
  ids.engine = await engineIn(crew.orgId);
  ids.chassis = await chassisIn(crew.orgId, "hours");
  ids.part = await createPart(testDb(), crew.orgId, { serial: "ACC-1", kind: "piston", engineId: ids.engine, cylinderNo: 1, installedOn: daysAgo(9) });
  ids.usage = await logUsage(testDb(), crew.orgId, { engineId: ids.engine, occurredOn: daysAgo(3), amount: 1 });
  ids.service = await recordService(testDb(), crew.orgId, { engineId: ids.engine, kind: "top_end", doneOn: daysAgo(5) });
  ids.set = await createReadingSet(testDb(), crew.orgId, { engineId: ids.engine, takenOn: daysAgo(2), elevationM: 366, cylinders: [{ cylinderNo: 1, leakdownPct: 4 }] });
  ids.cls = await createRacingClass(testDb(), crew.orgId, { name: "Access class" });
  const jpeg = await sharp({ create: { width: 40, height: 30, channels: 3, background: { r: 1, g: 2, b: 3 } } }).jpeg().toBuffer();
  ids.upload = (await upload(crew.mechanic, { engineId: String(ids.engine) }, { name: "a.jpg", bytes: jpeg })).body.upload.id;
});

type Route = [method: "GET" | "POST" | "PATCH" | "DELETE", path: () => string, body?: unknown | (() => unknown)];

const set = { engineId: 0, takenOn: "2026-01-01", setKind: "build", cylinders: [{ cylinderNo: 1, leakdownPct: 4 }] };
const READS: Route[] = [
  ["GET", () => "/api/v1/engines"],
  ["GET", () => `/api/v1/engines/${ids.engine}`],
  ["GET", () => `/api/v1/engines/${ids.engine}/counters`],
  ["GET", () => `/api/v1/engines/${ids.engine}/timeline`],
  ["GET", () => `/api/v1/engines/${ids.engine}/services`],
  ["GET", () => "/api/v1/racing-classes"],
  ["GET", () => `/api/v1/racing-classes/${ids.cls}`],
  ["GET", () => "/api/v1/chassis"],
  ["GET", () => `/api/v1/chassis/${ids.chassis}`],
  ["GET", () => "/api/v1/parts"],
  ["GET", () => `/api/v1/parts/${ids.part}`],
  ["GET", () => `/api/v1/parts/${ids.part}/events`],
  ["GET", () => "/api/v1/usage"],
  ["GET", () => `/api/v1/usage/${ids.usage}`],
  ["GET", () => "/api/v1/reading-sets"],
  ["GET", () => `/api/v1/reading-sets/${ids.set}`],
  ["GET", () => "/api/v1/uploads"],
  ["GET", () => `/api/v1/uploads/${ids.upload}`],
  ["GET", () => "/api/v1/exports/usage"],
  ["GET", () => "/api/v1/exports/readings"],
];
const WRITES: Route[] = [
  ["POST", () => "/api/v1/engines", { name: "W", cylinders: 1, boreMm: 50, strokeMm: 50 }],
  ["PATCH", () => `/api/v1/engines/${ids.engine}`, { notes: "w" }],
  ["DELETE", () => `/api/v1/engines/${ids.engine}`],
  ["POST", () => `/api/v1/engines/${ids.engine}/services`, { kind: "inspection", doneOn: "2026-01-01" }],
  ["DELETE", () => `/api/v1/engines/${ids.engine}/services/${ids.service}`],
  ["POST", () => "/api/v1/racing-classes", { name: "W" }],
  ["PATCH", () => `/api/v1/racing-classes/${ids.cls}`, { notes: "w" }],
  ["DELETE", () => `/api/v1/racing-classes/${ids.cls}`],
  ["POST", () => "/api/v1/chassis", { number: "W", kind: "sled" }],
  ["PATCH", () => `/api/v1/chassis/${ids.chassis}`, { notes: "w" }],
  ["DELETE", () => `/api/v1/chassis/${ids.chassis}`],
  ["POST", () => `/api/v1/chassis/${ids.chassis}/install`, () => ({ engineId: ids.engine })],
  ["POST", () => `/api/v1/chassis/${ids.chassis}/remove`, {}],
  ["POST", () => "/api/v1/parts", { serial: "W", kind: "rod" }],
  ["PATCH", () => `/api/v1/parts/${ids.part}`, { notes: "w" }],
  ["DELETE", () => `/api/v1/parts/${ids.part}`],
  ["POST", () => `/api/v1/parts/${ids.part}/move`, { toEngineId: null, movedOn: "2026-01-01" }],
  ["POST", () => `/api/v1/parts/${ids.part}/events`, { kind: "oversize", amountMm: 0.25, doneOn: "2026-01-01" }],
  ["POST", () => "/api/v1/usage", () => ({ engineId: ids.engine, occurredOn: "2026-01-01", amount: 1 })],
  ["PATCH", () => `/api/v1/usage/${ids.usage}`, { archived: true }],
  ["DELETE", () => `/api/v1/usage/${ids.usage}`],
  ["POST", () => "/api/v1/usage/import/preview", { csv: "Engine,Date,Hours\n" }],
  ["POST", () => "/api/v1/usage/import/commit", { csv: "Engine,Date,Hours\n" }],
  ["POST", () => "/api/v1/reading-sets", () => ({ ...set, engineId: ids.engine })],
  ["POST", () => "/api/v1/reading-sets/preview", () => ({ ...set, engineId: ids.engine })],
  ["POST", () => `/api/v1/reading-sets/${ids.set}/baseline`, { isBaseline: true }],
  ["PATCH", () => `/api/v1/reading-sets/${ids.set}`, { archived: true }],
  ["DELETE", () => `/api/v1/reading-sets/${ids.set}`],
  ["PATCH", () => `/api/v1/uploads/${ids.upload}`, { archived: true }],
  ["DELETE", () => `/api/v1/uploads/${ids.upload}`],
];
const ID_ROUTE = /\/\d+(\/|$)/;

async function call(client: ApiClient, [method, path, body]: Route): Promise<number> {
  return (await client.request(method, path(), typeof body === "function" ? body() : body)).status;
}

describe("every motors route", () => {
  it("answers 401 without a session", async () => {
    const anon = new ApiClient();
    for (const route of [...READS, ...WRITES]) expect([route[0], route[1](), await call(anon, route)]).toEqual([route[0], route[1](), 401]);
  });

  it("answers 403 to a viewer on every write, and lets the viewer read", async () => {
    for (const route of WRITES) expect([route[0], route[1](), await call(crew.viewer, route)]).toEqual([route[0], route[1](), 403]);
    for (const route of READS.filter((r) => !r[1]().startsWith("/api/v1/exports"))) {
      expect([route[1](), await call(crew.viewer, route)]).toEqual([route[1](), 200]);
    }
    expect((await testDb()("engines").where({ id: ids.engine }).first()).notes).toBeNull();
    expect((await testDb()("usage_entries").where({ id: ids.usage }).first()).archived_at).toBeNull();
  });

  it("answers 404 to another organisation on every route naming one of our records", async () => {
    for (const route of [...READS, ...WRITES].filter((r) => ID_ROUTE.test(r[1]()))) {
      expect([route[0], route[1](), await call(other.owner, route)]).toEqual([route[0], route[1](), 404]);
    }
    expect((await testDb()("engines").where({ id: ids.engine }).first()).archived_at).toBeNull();
    expect((await testDb()("reading_sets").where({ id: ids.set }).first()).is_baseline).toBe(0);
    expect(await testDb()("installations").where({ engine_id: ids.engine }).first()).toBeUndefined();
  });
});
