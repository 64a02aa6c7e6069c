import { beforeAll, describe, expect, it } from "vitest";
import { ApiClient } from "../support/api.ts";
import { testDb } from "../support/db.ts";
import { chassisIn, createCrew, daysAgo, engineIn, type Crew } from "./motors-fixtures.ts";

let crew: Crew;
let other: Crew;

beforeAll(async () => {
  crew = await createCrew();
  other = await createCrew();
});

const at = (daysBack: number, hour = 12): string => `${daysAgo(daysBack)}T${String(hour).padStart(2, "0")}:00:00Z`;

describe("chassis", () => {
  it("creates, lists with the engine inside, updates and archives", async () => {
    const res = await crew.manager.post("/api/v1/chassis", { number: "27", kind: "sled", meterKind: "hours", notes: "Cross sled" });
    expect(res.status).toBe(201);
    const id = res.body.chassis.id;
    expect(res.body.chassis).toMatchObject({ number: "27", kind: "sled", meterKind: "hours", current: null, lastMeterReading: null });
    const dup = await crew.manager.post("/api/v1/chassis", { number: "27", kind: "sled" });
    expect(dup.status).toBe(409);
    const bad = await crew.manager.post("/api/v1/chassis", { number: "", kind: "boat", meterKind: "miles" });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["kind", "meterKind", "number"]);
    expect((await crew.owner.patch(`/api/v1/chassis/${id}`, { notes: "Kaja's" })).body.chassis.notes).toBe("Kaja's");
    const list = await crew.viewer.get("/api/v1/chassis");
    expect(list.body.chassis.map((c: { id: number }) => c.id)).toContain(id);
    expect((await crew.owner.delete(`/api/v1/chassis/${id}`)).body.chassis.archivedAt).not.toBeNull();
    expect((await crew.viewer.get("/api/v1/chassis")).body.chassis.map((c: { id: number }) => c.id)).not.toContain(id);
  });
});

describe("installing and removing engines", () => {
  it("installs with the meter, keeps one engine per chassis and one chassis per engine, and counts the meter at removal", async () => {
    const engine = await engineIn(crew.orgId, { status: "spare" });
    const second = await engineIn(crew.orgId);
    const chassis = await chassisIn(crew.orgId, "hours");
    const other2 = await chassisIn(crew.orgId, "hours");

    const inst = await crew.manager.post(`/api/v1/chassis/${chassis}/install`, { engineId: engine, installedAt: at(10), meterAtInstall: 100.5 });
    expect(inst.status).toBe(201);
    expect(inst.body.installation).toMatchObject({ engineId: engine, chassisId: chassis, meterAtInstall: 100.5, removedAt: null });
    expect((await testDb()("engines").where({ id: engine }).first()).status).toBe("running");

    expect((await crew.manager.post(`/api/v1/chassis/${chassis}/install`, { engineId: second, installedAt: at(9) })).status).toBe(409);
    expect((await crew.manager.post(`/api/v1/chassis/${other2}/install`, { engineId: engine, installedAt: at(9) })).status).toBe(409);
    expect(await testDb()("installations").where({ chassis_id: other2 }).first()).toBeUndefined();

    const low = await crew.manager.post(`/api/v1/chassis/${chassis}/remove`, { removedAt: at(3), meterAtRemoval: 99 });
    expect(low.status).toBe(400);
    expect(low.body.error.fields.meterAtRemoval).toBeTruthy();
    const early = await crew.manager.post(`/api/v1/chassis/${chassis}/remove`, { removedAt: at(11) });
    expect(early.status).toBe(400);
    expect(early.body.error.fields.removedAt).toBeTruthy();

    const out = await crew.manager.post(`/api/v1/chassis/${chassis}/remove`, { removedAt: at(3), meterAtRemoval: 103.25, status: "spare" });
    expect(out.status).toBe(200);
    expect(out.body.installation).toMatchObject({ meterAtRemoval: 103.25 });
    const counters = (await crew.viewer.get(`/api/v1/engines/${engine}/counters`)).body.counters;
    expect(counters.sinceNew).toBe(2.75);
    const entry = await testDb()("usage_entries").where({ engine_id: engine }).first();
    expect(entry).toMatchObject({ source: "meter", amount: 2.75, meter_reading: 103.25, occurred_on: daysAgo(3) });
    expect((await testDb()("engines").where({ id: engine }).first()).status).toBe("spare");

    // The chassis is free again, and a new installation may not start before the last removal.
    expect((await crew.manager.post(`/api/v1/chassis/${chassis}/install`, { engineId: second, installedAt: at(4) })).status).toBe(400);
    const again = await crew.manager.post(`/api/v1/chassis/${chassis}/install`, { engineId: second, installedAt: at(2), meterAtInstall: 103.25 });
    expect(again.status).toBe(201);
    const history = await crew.viewer.get(`/api/v1/chassis/${chassis}`);
    expect(history.body.installations).toHaveLength(2);
    expect(history.body.chassis.current.engineId).toBe(second);
    expect(history.body.chassis.lastMeterReading).toBe(103.25);
    const audit = await testDb()("audit_log").where({ organisation_id: crew.orgId }).whereIn("action", ["engine.installed", "engine.removed"]).count({ n: "*" }).first();
    expect(Number(audit?.n)).toBeGreaterThanOrEqual(3);
  });

  it("does not count the meter twice when the installation's usage was logged as durations", async () => {
    const engine = await engineIn(crew.orgId);
    const chassis = await chassisIn(crew.orgId, "hours");
    await crew.manager.post(`/api/v1/chassis/${chassis}/install`, { engineId: engine, installedAt: at(6), meterAtInstall: 10 });
    expect((await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(5), amount: 1.5 })).status).toBe(201);
    const metered = await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(4), meterReading: 12 });
    expect(metered.status).toBe(409);
    await crew.manager.post(`/api/v1/chassis/${chassis}/remove`, { removedAt: at(1), meterAtRemoval: 11.6 });
    expect((await crew.viewer.get(`/api/v1/engines/${engine}/counters`)).body.counters.sinceNew).toBe(1.5);
  });

  it("refuses meter values on a chassis without a meter, and retired engines", async () => {
    const engine = await engineIn(crew.orgId);
    const chassis = await chassisIn(crew.orgId, "none");
    const res = await crew.manager.post(`/api/v1/chassis/${chassis}/install`, { engineId: engine, meterAtInstall: 5 });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.meterAtInstall).toBeTruthy();
    const retired = await engineIn(crew.orgId, { status: "retired" });
    expect((await crew.manager.post(`/api/v1/chassis/${chassis}/install`, { engineId: retired })).status).toBe(409);
    expect((await crew.manager.post(`/api/v1/chassis/${chassis}/remove`, {})).status).toBe(409);
  });

  it("lets only one of two simultaneous installs of the same engine succeed", async () => {
    const engine = await engineIn(crew.orgId);
    const [c1, c2] = [await chassisIn(crew.orgId, "none"), await chassisIn(crew.orgId, "none")];
    const results = await Promise.all([
      crew.manager.post(`/api/v1/chassis/${c1}/install`, { engineId: engine }),
      crew.owner.post(`/api/v1/chassis/${c2}/install`, { engineId: engine }),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual([201, 409]);
    const open = await testDb()("installations").where({ engine_id: engine }).whereNull("removed_at").count({ n: "*" }).first();
    expect(Number(open?.n)).toBe(1);
  });
});

describe("who may do what on chassis", () => {
  it("answers 401, 403 and 404 as it should, changing nothing", async () => {
    const chassis = await chassisIn(crew.orgId, "none");
    const engine = await engineIn(crew.orgId);
    expect((await new ApiClient().get("/api/v1/chassis")).status).toBe(401);
    expect((await new ApiClient().post(`/api/v1/chassis/${chassis}/install`, { engineId: engine })).status).toBe(401);
    for (const client of [crew.viewer, crew.mechanic]) {
      expect((await client.post("/api/v1/chassis", { number: "X1", kind: "sled" })).status).toBe(403);
      expect((await client.patch(`/api/v1/chassis/${chassis}`, { notes: "x" })).status).toBe(403);
      expect((await client.post(`/api/v1/chassis/${chassis}/install`, { engineId: engine })).status).toBe(403);
      expect((await client.post(`/api/v1/chassis/${chassis}/remove`, {})).status).toBe(403);
      expect((await client.delete(`/api/v1/chassis/${chassis}`)).status).toBe(403);
    }
    expect(await testDb()("installations").where({ chassis_id: chassis }).first()).toBeUndefined();
    expect((await other.owner.get(`/api/v1/chassis/${chassis}`)).status).toBe(404);
    expect((await other.owner.patch(`/api/v1/chassis/${chassis}`, { notes: "ours" })).status).toBe(404);
    expect((await other.owner.post(`/api/v1/chassis/${chassis}/install`, { engineId: engine })).status).toBe(404);
    expect((await other.owner.post(`/api/v1/chassis/${chassis}/remove`, {})).status).toBe(404);
    expect((await other.owner.delete(`/api/v1/chassis/${chassis}`)).status).toBe(404);
    // Their own chassis with our engine: the engine is not theirs to install.
    const theirs = await chassisIn(other.orgId, "none");
    const res = await other.owner.post(`/api/v1/chassis/${theirs}/install`, { engineId: engine });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.engineId).toBeTruthy();
    expect((await other.owner.get("/api/v1/chassis")).body.chassis.map((c: { id: number }) => c.id)).not.toContain(chassis);
  });
});
