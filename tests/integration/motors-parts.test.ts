import { beforeAll, describe, expect, it } from "vitest";
import { ApiClient } from "../support/api.ts";
import { testDb } from "../support/db.ts";
import { logUsage, recordService } from "../factories/motors.ts";
import { createCrew, daysAgo, engineIn, type Crew } from "./motors-fixtures.ts";

let crew: Crew;
let other: Crew;

beforeAll(async () => {
  crew = await createCrew();
  other = await createCrew();
});

describe("parts", () => {
  it("creates a part in an engine, lists it, updates it, and archives it only from the shelf", async () => {
    const engine = await engineIn(crew.orgId);
    const res = await crew.mechanic.post("/api/v1/parts", { serial: "P-100", kind: "piston", engineId: engine, cylinderNo: 2, usageLimit: 8, installedOn: daysAgo(20) });
    expect(res.status).toBe(201);
    const part = res.body.part;
    expect(part).toMatchObject({ serial: "P-100", kind: "piston", engineId: engine, cylinderNo: 2, usageLimit: 8, totalCutMm: 0 });
    expect((await crew.mechanic.post("/api/v1/parts", { serial: "P-100", kind: "piston" })).status).toBe(409);
    const badCyl = await crew.mechanic.post("/api/v1/parts", { serial: "P-101", kind: "piston", engineId: engine, cylinderNo: 5 });
    expect(badCyl.status).toBe(400);
    expect(badCyl.body.error.fields.cylinderNo).toBeTruthy();
    const list = await crew.viewer.get(`/api/v1/parts?engineId=${engine}`);
    expect(list.body.parts.map((p: { id: number }) => p.id)).toEqual([part.id]);
    expect((await crew.mechanic.patch(`/api/v1/parts/${part.id}`, { description: "Forged" })).body.part.description).toBe("Forged");
    expect((await crew.mechanic.delete(`/api/v1/parts/${part.id}`)).status).toBe(409);
    await crew.mechanic.post(`/api/v1/parts/${part.id}/move`, { toEngineId: null, movedOn: daysAgo(1) });
    const archived = await crew.mechanic.delete(`/api/v1/parts/${part.id}`);
    expect(archived.status).toBe(200);
    expect(archived.body.part.archivedAt).not.toBeNull();
  });

  it("records cuts with a running total and oversizes that only go up, flagging the part's own limit", async () => {
    const engine = await engineIn(crew.orgId);
    const head = (await crew.manager.post("/api/v1/parts", { serial: "H-1", kind: "head", engineId: engine, maxTotalCutMm: 0.25 })).body.part;
    const first = await crew.manager.post(`/api/v1/parts/${head.id}/events`, { kind: "cut", amountMm: 0.15, doneOn: daysAgo(5) });
    expect(first.status).toBe(201);
    expect(first.body).toMatchObject({ overLimit: false, part: { totalCutMm: 0.15 }, event: { kind: "cut", amountMm: 0.15, totalAfterMm: 0.15 } });
    const second = await crew.manager.post(`/api/v1/parts/${head.id}/events`, { kind: "cut", amountMm: 0.15, doneOn: daysAgo(4) });
    expect(second.body).toMatchObject({ overLimit: true, part: { totalCutMm: 0.3 } });
    expect((await crew.manager.post(`/api/v1/parts/${head.id}/events`, { kind: "oversize", amountMm: 0.25, doneOn: daysAgo(4) })).status).toBe(400);

    const piston = (await crew.manager.post("/api/v1/parts", { serial: "P-OS", kind: "piston", engineId: engine, cylinderNo: 1 })).body.part;
    expect((await crew.manager.post(`/api/v1/parts/${piston.id}/events`, { kind: "oversize", amountMm: 0.5, doneOn: daysAgo(3) })).body.part.oversizeMm).toBe(0.5);
    const down = await crew.manager.post(`/api/v1/parts/${piston.id}/events`, { kind: "oversize", amountMm: 0.25, doneOn: daysAgo(2) });
    expect(down.status).toBe(400);
    expect(down.body.error.fields.amountMm).toBeTruthy();
    const detail = await crew.viewer.get(`/api/v1/parts/${head.id}`);
    expect(detail.body.events.map((e: { totalAfterMm: number }) => e.totalAfterMm)).toEqual([0.3, 0.15]);
    const timeline = await crew.viewer.get(`/api/v1/engines/${engine}/timeline`);
    expect(timeline.body.items.filter((i: { kind: string }) => i.kind === "part_cut")).toHaveLength(2);
  });
});

describe("part counters follow the part between engines", () => {
  it("counts usage in each engine only while the part was in it, and since the current engine's services", async () => {
    const a = await engineIn(crew.orgId);
    const b = await engineIn(crew.orgId);
    const crank = (await crew.manager.post("/api/v1/parts", { serial: "CR-MOVE", kind: "crank", engineId: a, installedOn: daysAgo(30), usageLimit: 10, initialUsage: 1 })).body.part;
    await logUsage(testDb(), crew.orgId, { engineId: a, occurredOn: daysAgo(30), amount: 100 }); // same day as fitting: not the crank's
    await logUsage(testDb(), crew.orgId, { engineId: a, occurredOn: daysAgo(25), amount: 2 });
    await logUsage(testDb(), crew.orgId, { engineId: a, occurredOn: daysAgo(20), amount: 3 }); // the day it moves out: still in A
    const early = await crew.mechanic.post(`/api/v1/parts/${crank.id}/move`, { toEngineId: b, movedOn: daysAgo(31) });
    expect(early.status).toBe(400);
    expect(early.body.error.fields.movedOn).toBeTruthy();
    const moved = await crew.mechanic.post(`/api/v1/parts/${crank.id}/move`, { toEngineId: b, movedOn: daysAgo(20) });
    expect(moved.status).toBe(200);
    await logUsage(testDb(), crew.orgId, { engineId: a, occurredOn: daysAgo(15), amount: 50 }); // A after the move: not the crank's
    await logUsage(testDb(), crew.orgId, { engineId: b, occurredOn: daysAgo(15), amount: 4 });
    await recordService(testDb(), crew.orgId, { engineId: b, kind: "top_end", doneOn: daysAgo(10) });
    await logUsage(testDb(), crew.orgId, { engineId: b, occurredOn: daysAgo(5), amount: 1.5 });

    const detail = await crew.viewer.get(`/api/v1/parts/${crank.id}`);
    expect(detail.body.part.engineId).toBe(b);
    expect(detail.body.part.counters).toMatchObject({ sinceNew: 11.5, inCurrentEngine: 5.5, sinceTopEnd: 1.5, sinceBottomEnd: 5.5 });
    expect(detail.body.part.counters.life).toMatchObject({ used: 11.5, limit: 10, level: "act" });
    expect(detail.body.moves.map((m: { toEngineId: number | null }) => m.toEngineId)).toEqual([b, a]);

    const engineB = await crew.viewer.get(`/api/v1/engines/${b}/counters`);
    expect(engineB.body.parts.map((p: { id: number }) => p.id)).toEqual([crank.id]);
    expect(engineB.body.counters.topEnd.used).toBe(1.5);

    await crew.mechanic.post(`/api/v1/parts/${crank.id}/move`, { toEngineId: null, movedOn: daysAgo(2) });
    await logUsage(testDb(), crew.orgId, { engineId: b, occurredOn: daysAgo(1), amount: 7 });
    const shelf = (await crew.viewer.get(`/api/v1/parts/${crank.id}`)).body.part;
    expect(shelf.counters).toMatchObject({ sinceNew: 11.5, inCurrentEngine: null, sinceTopEnd: null });
    expect((await crew.viewer.get(`/api/v1/engines/${b}/counters`)).body.parts).toHaveLength(0);
    const t = (await crew.viewer.get(`/api/v1/engines/${b}/timeline`)).body.items.map((i: { kind: string }) => i.kind);
    expect(t).toContain("part_in");
    expect(t).toContain("part_out");
  });
});

describe("who may do what on parts", () => {
  it("answers 401, 403 and 404 as it should, changing nothing", async () => {
    const engine = await engineIn(crew.orgId);
    const part = (await crew.manager.post("/api/v1/parts", { serial: "P-PERM", kind: "piston", engineId: engine, cylinderNo: 1 })).body.part;
    expect((await new ApiClient().get("/api/v1/parts")).status).toBe(401);
    for (const client of [crew.viewer, crew.chief]) {
      expect((await client.post("/api/v1/parts", { serial: "X", kind: "piston" })).status).toBe(403);
      expect((await client.patch(`/api/v1/parts/${part.id}`, { notes: "x" })).status).toBe(403);
      expect((await client.post(`/api/v1/parts/${part.id}/move`, { toEngineId: null, movedOn: daysAgo(1) })).status).toBe(403);
      expect((await client.post(`/api/v1/parts/${part.id}/events`, { kind: "oversize", amountMm: 0.25, doneOn: daysAgo(1) })).status).toBe(403);
      expect((await client.delete(`/api/v1/parts/${part.id}`)).status).toBe(403);
    }
    for (const path of [`/api/v1/parts/${part.id}`, `/api/v1/parts/${part.id}/events`]) expect((await other.owner.get(path)).status).toBe(404);
    expect((await other.owner.post(`/api/v1/parts/${part.id}/move`, { toEngineId: null, movedOn: daysAgo(1) })).status).toBe(404);
    expect((await other.owner.patch(`/api/v1/parts/${part.id}`, { notes: "ours" })).status).toBe(404);
    // Moving our part into their engine from our side: their engine is unknown here.
    const theirs = await engineIn(other.orgId);
    const res = await crew.manager.post(`/api/v1/parts/${part.id}/move`, { toEngineId: theirs, movedOn: daysAgo(1) });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.toEngineId).toBeTruthy();
    const row = await testDb()("parts").where({ id: part.id }).first();
    expect(Number(row.engine_id)).toBe(engine);
    expect(row.notes).toBeNull();
  });
});
