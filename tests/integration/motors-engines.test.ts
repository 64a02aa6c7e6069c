import { beforeAll, describe, expect, it } from "vitest";
import { ApiClient } from "../support/api.ts";
import { testDb } from "../support/db.ts";
import { createRacingClass, logUsage, recordService } from "../factories/motors.ts";
import { createCrew, daysAgo, engineIn, type Crew } from "./motors-fixtures.ts";

let crew: Crew;
let other: Crew;

beforeAll(async () => {
  crew = await createCrew();
  other = await createCrew();
});

const A1_SPEC = {
  name: "Twin A",
  serial: "SN-1",
  cylinders: 2,
  boreMm: 72,
  strokeMm: 73.8,
  rodMm: 130,
  exhaustOpensDegAtdc: 82,
  targetRatio: 13.73,
  topEndLimit: 8,
  bottomEndLimit: 24,
};

describe("engines: create, read, update, archive", () => {
  it("creates an engine with its spec, computes its swept volume, and audits it", async () => {
    const res = await crew.manager.post("/api/v1/engines", { ...A1_SPEC, name: "Create Me", status: "spare" });
    expect(res.status).toBe(201);
    const engine = res.body.engine;
    expect(engine).toMatchObject({ name: "Create Me", cylinders: 2, boreMm: 72, strokeMm: 73.8, status: "spare", planFraction: 0.8 });
    // π/4 · 72² · 73.8 mm³ = 300 476.9 mm³ = 300.477 cc (DEMO.md rounds to 300.5)
    expect(engine.sweptCc).toBeCloseTo(300.477, 3);
    expect(engine.displacementCc).toBeCloseTo(600.954, 3);
    const audit = await testDb()("audit_log").where({ organisation_id: crew.orgId, action: "engine.created", entity_id: String(engine.id) }).first();
    expect(audit).toBeTruthy();
  });

  it("names every bad field, and checks fields against each other", async () => {
    const res = await crew.owner.post("/api/v1/engines", { name: "", cylinders: 0, boreMm: -1, strokeMm: "x" });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(["boreMm", "cylinders", "name", "strokeMm"]);
    const rod = await crew.owner.post("/api/v1/engines", { ...A1_SPEC, name: "Short rod", rodMm: 30 });
    expect(rod.status).toBe(400);
    expect(rod.body.error.fields.rodMm).toMatch(/half the stroke/);
    const timing = await crew.owner.post("/api/v1/engines", { ...A1_SPEC, name: "Four", cycle: "four_stroke" });
    expect(timing.status).toBe(400);
    expect(timing.body.error.fields.exhaustOpensDegAtdc).toBeTruthy();
  });

  it("refuses a second engine with the same name (409) and another organisation's class (400)", async () => {
    await crew.owner.post("/api/v1/engines", { ...A1_SPEC, name: "Same Name" });
    const dup = await crew.owner.post("/api/v1/engines", { ...A1_SPEC, name: "Same Name" });
    expect(dup.status).toBe(409);
    expect(dup.body.error.fields.name).toBeTruthy();
    const foreignClass = await createRacingClass(testDb(), other.orgId, { name: "Foreign class" });
    const res = await crew.owner.post("/api/v1/engines", { ...A1_SPEC, name: "Classy", racingClassId: foreignClass });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.racingClassId).toBeTruthy();
  });

  it("updates fields, re-checks them against the stored spec, and archives instead of deleting", async () => {
    const id = (await crew.owner.post("/api/v1/engines", { ...A1_SPEC, name: "Patch Me" })).body.engine.id;
    const ok = await crew.manager.patch(`/api/v1/engines/${id}`, { notes: "New rings", topEndLimit: 9 });
    expect(ok.status).toBe(200);
    expect(ok.body.engine).toMatchObject({ notes: "New rings", topEndLimit: 9 });
    const bad = await crew.manager.patch(`/api/v1/engines/${id}`, { strokeMm: 300 });
    expect(bad.status).toBe(400);
    const badRod = await crew.manager.patch(`/api/v1/engines/${id}`, { rodMm: 20 });
    expect(badRod.status).toBe(400);
    expect(badRod.body.error.fields.rodMm).toBeTruthy();
    const del = await crew.manager.delete(`/api/v1/engines/${id}`);
    expect(del.status).toBe(200);
    expect(del.body.engine.archivedAt).not.toBeNull();
    expect(await testDb()("engines").where({ id }).first()).toBeTruthy();
    const roster = await crew.viewer.get("/api/v1/engines?search=Patch%20Me");
    expect(roster.body.engines).toHaveLength(0);
    const withArchived = await crew.viewer.get("/api/v1/engines?search=Patch%20Me&includeArchived=true");
    expect(withArchived.body.engines).toHaveLength(1);
    const restore = await crew.manager.patch(`/api/v1/engines/${id}`, { archived: false });
    expect(restore.body.engine.archivedAt).toBeNull();
    const actions = await testDb()("audit_log").where({ entity: "engine", entity_id: String(id) }).orderBy("id").pluck("action");
    expect(actions).toEqual(["engine.created", "engine.updated", "engine.archived", "engine.restored"]);
  });

  it("reads the engine file: spec, counters, parts, class", async () => {
    const cls = await createRacingClass(testDb(), crew.orgId, { name: `Class ${Date.now()}`, maxDisplacementCc: 602 });
    const id = await engineIn(crew.orgId, { racingClassId: cls });
    const res = await crew.viewer.get(`/api/v1/engines/${id}`);
    expect(res.status).toBe(200);
    expect(res.body.engine.id).toBe(id);
    expect(res.body.racingClass.id).toBe(cls);
    expect(res.body.counters.topEnd).toMatchObject({ used: 0, limit: 8, level: "fine" });
    expect(res.body.installation).toBeNull();
    expect(res.body.latestReadingSet).toBeNull();
  });
});

describe("the roster", () => {
  let fleet: Crew;
  beforeAll(async () => {
    fleet = await createCrew();
    const specs: [string, string, number, number | null][] = [
      ["Alpha", "running", 7.5, 8],
      ["Bravo", "bench", 2, 8],
      ["Charlie", "spare", 0, 8],
      ["Delta", "retired", 30, null],
      ["Echo", "running", 4, 10],
    ];
    for (const [name, status, used, limit] of specs) {
      const id = await engineIn(fleet.orgId, { name, status: status as "running", topEndLimit: limit, serial: `SER-${name}` });
      if (used > 0) await logUsage(testDb(), fleet.orgId, { engineId: id, occurredOn: daysAgo(5), amount: used });
    }
  });

  it("pages, counts and sorts by name by default", async () => {
    const res = await fleet.viewer.get("/api/v1/engines?perPage=2&page=2");
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(5);
    expect(res.body.engines.map((e: { name: string }) => e.name)).toEqual(["Charlie", "Delta"]);
  });

  it("filters by status and searches names and serials", async () => {
    const running = await fleet.viewer.get("/api/v1/engines?status=running,bench");
    expect(running.body.engines.map((e: { name: string }) => e.name)).toEqual(["Alpha", "Bravo", "Echo"]);
    const search = await fleet.viewer.get("/api/v1/engines?search=ser-ech");
    expect(search.body.engines.map((e: { name: string }) => e.name)).toEqual(["Echo"]);
    const bad = await fleet.viewer.get("/api/v1/engines?status=flying&sort=colour");
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["sort", "status"]);
  });

  it("sorts by counters and by share of the limit, engines without a limit last", async () => {
    const used = await fleet.viewer.get("/api/v1/engines?sort=-sinceTopEnd");
    expect(used.body.engines.map((e: { name: string }) => e.name)).toEqual(["Delta", "Alpha", "Echo", "Bravo", "Charlie"]);
    const share = await fleet.viewer.get("/api/v1/engines?sort=-topEndShare");
    expect(share.body.engines.map((e: { name: string }) => e.name)).toEqual(["Alpha", "Echo", "Bravo", "Charlie", "Delta"]);
    const alpha = share.body.engines[0];
    expect(alpha.counters.topEnd).toMatchObject({ used: 7.5, limit: 8, level: "watch" });
    expect(alpha.counters.topEnd.share).toBeCloseTo(0.9375, 6);
  });
});

describe("counters, services and the timeline", () => {
  it("restarts the top-end counter the day after a service, and the timeline lists both", async () => {
    const id = await engineIn(crew.orgId);
    await logUsage(testDb(), crew.orgId, { engineId: id, occurredOn: daysAgo(10), amount: 3 });
    await logUsage(testDb(), crew.orgId, { engineId: id, occurredOn: daysAgo(6), amount: 2 });
    const service = await crew.mechanic.post(`/api/v1/engines/${id}/services`, { kind: "top_end", doneOn: daysAgo(6), notes: "Rings" });
    expect(service.status).toBe(201);
    await logUsage(testDb(), crew.orgId, { engineId: id, occurredOn: daysAgo(2), amount: 1.25 });
    const c = await crew.viewer.get(`/api/v1/engines/${id}/counters`);
    expect(c.status).toBe(200);
    expect(c.body.counters.sinceNew).toBe(6.25);
    // usage dated the service's own day counts before it (docs/decisions/040)
    expect(c.body.counters.topEnd).toMatchObject({ used: 1.25, lastOn: daysAgo(6) });
    expect(c.body.counters.bottomEnd.used).toBe(6.25);

    const undo = await crew.mechanic.delete(`/api/v1/engines/${id}/services/${service.body.service.id}`);
    expect(undo.status).toBe(200);
    expect((await crew.viewer.get(`/api/v1/engines/${id}/counters`)).body.counters.topEnd.used).toBe(6.25);

    const t = await crew.viewer.get(`/api/v1/engines/${id}/timeline`);
    expect(t.status).toBe(200);
    expect(t.body.items.map((i: { kind: string }) => i.kind)).toEqual(["usage", "usage", "usage"]);
    await recordService(testDb(), crew.orgId, { engineId: id, kind: "bottom_end", doneOn: daysAgo(1) });
    const t2 = await crew.viewer.get(`/api/v1/engines/${id}/timeline?limit=2`);
    expect(t2.body.total).toBe(4);
    expect(t2.body.items.map((i: { kind: string }) => i.kind)).toEqual(["service", "usage"]);
  });

  it("refuses a service dated in the future", async () => {
    const id = await engineIn(crew.orgId);
    const res = await crew.mechanic.post(`/api/v1/engines/${id}/services`, { kind: "top_end", doneOn: "2999-01-01" });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.doneOn).toBeTruthy();
  });
});

describe("racing classes", () => {
  it("creates, lists, updates and archives a class", async () => {
    const res = await crew.manager.post("/api/v1/racing-classes", { name: "Stock 600", minSquishMm: 1.1, maxDisplacementCc: 602, squishWireNote: "1.5 mm solder" });
    expect(res.status).toBe(201);
    const id = res.body.racingClass.id;
    expect((await crew.viewer.get("/api/v1/racing-classes")).body.racingClasses.map((c: { id: number }) => c.id)).toContain(id);
    expect((await crew.manager.patch(`/api/v1/racing-classes/${id}`, { minChamberCc: 23.2 })).body.racingClass.minChamberCc).toBe(23.2);
    expect((await crew.manager.delete(`/api/v1/racing-classes/${id}`)).body.racingClass.archivedAt).not.toBeNull();
    expect((await crew.viewer.get("/api/v1/racing-classes")).body.racingClasses.map((c: { id: number }) => c.id)).not.toContain(id);
    expect((await other.owner.get(`/api/v1/racing-classes/${id}`)).status).toBe(404);
  });
});

describe("who may do what on engines", () => {
  it("answers 401 without a session", async () => {
    const anon = new ApiClient();
    for (const path of ["/api/v1/engines", "/api/v1/racing-classes", "/api/v1/engines/1/timeline"]) {
      expect((await anon.get(path)).status).toBe(401);
    }
    expect((await anon.post("/api/v1/engines", A1_SPEC)).status).toBe(401);
  });

  it("refuses writes to a viewer and a mechanic (403) and changes nothing", async () => {
    const id = await engineIn(crew.orgId, { name: "Untouchable" });
    for (const client of [crew.viewer, crew.mechanic, crew.chief]) {
      expect((await client.post("/api/v1/engines", { ...A1_SPEC, name: "Nope" })).status).toBe(403);
      expect((await client.patch(`/api/v1/engines/${id}`, { notes: "x" })).status).toBe(403);
      expect((await client.delete(`/api/v1/engines/${id}`)).status).toBe(403);
      expect((await client.post("/api/v1/racing-classes", { name: "Nope" })).status).toBe(403);
    }
    expect((await crew.viewer.post(`/api/v1/engines/${id}/services`, { kind: "top_end", doneOn: daysAgo(1) })).status).toBe(403);
    const row = await testDb()("engines").where({ id }).first();
    expect(row.notes).toBeNull();
    expect(row.archived_at).toBeNull();
  });

  it("answers 404 for another organisation's engine on every engine route", async () => {
    const id = await engineIn(other.orgId, { name: "Theirs" });
    for (const path of [`/api/v1/engines/${id}`, `/api/v1/engines/${id}/timeline`, `/api/v1/engines/${id}/counters`, `/api/v1/engines/${id}/services`]) {
      expect((await crew.owner.get(path)).status).toBe(404);
    }
    expect((await crew.owner.patch(`/api/v1/engines/${id}`, { notes: "mine now" })).status).toBe(404);
    expect((await crew.owner.delete(`/api/v1/engines/${id}`)).status).toBe(404);
    expect((await crew.owner.post(`/api/v1/engines/${id}/services`, { kind: "top_end", doneOn: daysAgo(1) })).status).toBe(404);
    expect((await crew.owner.get("/api/v1/engines?search=Theirs")).body.engines).toHaveLength(0);
    expect((await testDb()("engines").where({ id }).first()).notes).toBeNull();
  });
});
