import { beforeAll, describe, expect, it } from "vitest";
import { ApiClient, DEMO, signedIn } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { createRacingClass, logUsage, recordService } from "../factories/motors.ts";
import { createCrew, daysAgo, engineIn, type Crew } from "./motors-fixtures.ts";

let crew: Crew;
let other: Crew;

beforeAll(async () => {
  crew = await createCrew();
  other = await createCrew();
});

const twinSet = (engineId: number, extra: Record<string, unknown> = {}) => ({
  engineId,
  takenOn: daysAgo(1),
  setKind: "build",
  airTempC: 12,
  methodNotes: "Burette in tenths, cold engine",
  cylinders: [
    { cylinderNo: 1, chamberReadingsCc: [23.6, 23.7, 23.6], flatPlateCc: 26.4, squishAMm: 1.2, squishBMm: 1.21, crankingKpa: 1006.6, leakdownPct: 4 },
    { cylinderNo: 2, chamberReadingsCc: [23.5, 23.5], flatPlateCc: 26.4, squishAMm: 1.21, squishBMm: 1.2, crankingKpa: 999.7, leakdownPct: 5 },
  ],
  ...extra,
});

async function setCount(engineId: number): Promise<{ sets: number; cylinders: number }> {
  const sets = await testDb()("reading_sets").where({ engine_id: engineId }).count({ n: "*" }).first();
  const cylinders = await testDb()("cylinder_readings as c").join("reading_sets as s", "s.id", "c.reading_set_id").where("s.engine_id", engineId).count({ n: "*" }).first();
  return { sets: Number(sets?.n), cylinders: Number(cylinders?.n) };
}

describe("reading sets", () => {
  it("saves a whole set in one go and answers with the computed figures", async () => {
    const cls = await createRacingClass(testDb(), crew.orgId, { name: `Cross ${Date.now()}`, minChamberCc: 23.55, minSquishMm: 1.1, maxDisplacementCc: 602 });
    const engine = await engineIn(crew.orgId, { racingClassId: cls });
    await logUsage(testDb(), crew.orgId, { engineId: engine, occurredOn: daysAgo(5), amount: 2.5 });
    const res = await crew.mechanic.post("/api/v1/reading-sets", twinSet(engine));
    expect(res.status).toBe(201);
    const set = res.body.readingSet;
    expect(set).toMatchObject({ engineId: engine, setKind: "build", isBaseline: false, elevationM: 366, takenBy: { name: "Test mechanic" } });
    expect(set.usageAtReading).toEqual({ sinceNew: 2.5, sinceTopEnd: 2.5, sinceBottomEnd: 2.5 });
    const [c1, c2] = set.figures.cylinders;
    // Vs = π/4 · 72² · 73.8 = 300.477 cc; (300.477 + 23.6) / 23.6 = 13.732 (DEMO.md: 13.73)
    expect(c1.chamber).toMatchObject({ status: "confirmed", valueCc: 23.6, agreeingIndexes: [0, 2] });
    expect(c1.geometricRatio).toBeCloseTo(13.732, 3);
    // Exhaust opening 82° ATDC with a 130 mm rod: DEMO.md's trapped ratio 7.38
    expect(c1.trappedRatio).toBeCloseTo(7.38, 2);
    expect(c1.chamberOffsetCc).toBeCloseTo(-2.8, 6);
    expect(c1.squishMeanMm).toBeCloseTo(1.205, 6);
    expect(c2.geometricRatio).toBeCloseTo((300.477 + 23.5) / 23.5, 3);
    expect(set.figures.chamberSpread.spread).toBeCloseTo(0.1, 6);
    // The class wants at least 23.55 cc: cylinder 2 at 23.5 does not comply.
    expect(set.figures.compliance.compliant).toBe(false);
    expect(set.figures.compliance.checks.find((c: { rule: string; cylinderNo: number }) => c.rule === "minChamberCc" && c.cylinderNo === 2).pass).toBe(false);
    expect((await crew.viewer.get(`/api/v1/reading-sets/${set.id}`)).body.readingSet.figures.cylinders[0].geometricRatio).toBeCloseTo(13.732, 3);
    expect(await testDb()("audit_log").where({ action: "reading_set.created", entity_id: String(set.id) }).first()).toBeTruthy();
  });

  it("keeps readings that never agreed, and says so", async () => {
    const engine = await engineIn(crew.orgId);
    const body = twinSet(engine);
    body.cylinders[0].chamberReadingsCc = [23.0, 23.6, 24.1];
    const res = await crew.mechanic.post("/api/v1/reading-sets", body);
    expect(res.status).toBe(201);
    const c1 = res.body.readingSet.figures.cylinders[0];
    expect(c1.chamber).toMatchObject({ status: "unconfirmed", valueCc: null, disagreeingIndexes: [0, 1, 2] });
    expect(c1.geometricRatio).toBeNull();
    expect(res.body.readingSet.cylinders[0].chamberReadingsCc).toEqual([23.0, 23.6, 24.1]);
  });

  it("writes nothing when one cylinder is bad", async () => {
    const engine = await engineIn(crew.orgId);
    const before = await setCount(engine);
    const third = twinSet(engine);
    third.cylinders.push({ ...third.cylinders[0], cylinderNo: 3 });
    const res = await crew.mechanic.post("/api/v1/reading-sets", third);
    expect(res.status).toBe(400);
    expect(res.body.error.fields["cylinders.2.cylinderNo"]).toMatch(/2 cylinders/);
    const negative = twinSet(engine);
    negative.cylinders[1].chamberReadingsCc = [23.5, -1];
    const neg = await crew.mechanic.post("/api/v1/reading-sets", negative);
    expect(neg.status).toBe(400);
    expect(Object.keys(neg.body.error.fields)).toEqual(["cylinders.1.chamberReadingsCc.1"]);
    const oneSide = twinSet(engine);
    (oneSide.cylinders[0] as Record<string, unknown>).squishBMm = null;
    expect((await crew.mechanic.post("/api/v1/reading-sets", oneSide)).body.error.fields["cylinders.0.squishBMm"]).toMatch(/both sides/);
    const twice = twinSet(engine);
    twice.cylinders[1].cylinderNo = 1;
    expect((await crew.mechanic.post("/api/v1/reading-sets", twice)).status).toBe(400);
    expect((await crew.mechanic.post("/api/v1/reading-sets", { ...twinSet(engine), takenOn: "2999-01-01" })).status).toBe(400);
    expect(await setCount(engine)).toEqual(before);
  });

  it("previews figures without writing", async () => {
    const engine = await engineIn(crew.orgId);
    const res = await crew.mechanic.post("/api/v1/reading-sets/preview", twinSet(engine));
    expect(res.status).toBe(200);
    expect(res.body.figures.cylinders[0].geometricRatio).toBeCloseTo(13.732, 3);
    expect(await setCount(engine)).toEqual({ sets: 0, cylinders: 0 });
  });

  it("lets leads mark the baseline, not mechanics, and archives a set instead of deleting it", async () => {
    const engine = await engineIn(crew.orgId);
    expect((await crew.mechanic.post("/api/v1/reading-sets", twinSet(engine, { isBaseline: true }))).status).toBe(403);
    expect(await setCount(engine)).toEqual({ sets: 0, cylinders: 0 });
    const byChief = await crew.chief.post("/api/v1/reading-sets", twinSet(engine, { isBaseline: true }));
    expect(byChief.body.readingSet.isBaseline).toBe(true);
    const id = (await crew.mechanic.post("/api/v1/reading-sets", twinSet(engine))).body.readingSet.id;
    expect((await crew.mechanic.post(`/api/v1/reading-sets/${id}/baseline`, { isBaseline: true })).status).toBe(403);
    expect((await crew.chief.post(`/api/v1/reading-sets/${id}/baseline`, { isBaseline: true })).body.readingSet.isBaseline).toBe(true);
    const file = await crew.viewer.get(`/api/v1/engines/${engine}`);
    expect(file.body.baselineReadingSet.id).toBe(id);
    expect(file.body.latestReadingSet.id).toBe(id);
    expect((await crew.mechanic.delete(`/api/v1/reading-sets/${id}`)).status).toBe(403);
    expect((await crew.chief.delete(`/api/v1/reading-sets/${id}`)).body.readingSet.archivedAt).not.toBeNull();
    expect(await testDb()("cylinder_readings").where({ reading_set_id: id }).count({ n: "*" }).first()).toEqual({ n: 2 });
    const list = await crew.viewer.get(`/api/v1/reading-sets?engineId=${engine}`);
    expect(list.body.readingSets.map((s: { id: number }) => s.id)).not.toContain(id);
    expect((await crew.viewer.get(`/api/v1/reading-sets?engineId=${engine}&includeArchived=true`)).body.total).toBe(2);
  });

  it("shows the usage at each reading: a teardown comes before that day's rebuild", async () => {
    const engine = await engineIn(crew.orgId);
    await logUsage(testDb(), crew.orgId, { engineId: engine, occurredOn: daysAgo(6), amount: 5.5 });
    await recordService(testDb(), crew.orgId, { engineId: engine, kind: "top_end", doneOn: daysAgo(3) });
    const teardown = await crew.mechanic.post("/api/v1/reading-sets", twinSet(engine, { takenOn: daysAgo(3), setKind: "teardown" }));
    const build = await crew.mechanic.post("/api/v1/reading-sets", twinSet(engine, { takenOn: daysAgo(3), setKind: "build" }));
    expect(teardown.body.readingSet.usageAtReading.sinceTopEnd).toBe(5.5);
    expect(build.body.readingSet.usageAtReading.sinceTopEnd).toBe(0);
  });

  it("answers 401, 403 and 404 as it should", async () => {
    const engine = await engineIn(crew.orgId);
    const id = (await crew.mechanic.post("/api/v1/reading-sets", twinSet(engine))).body.readingSet.id;
    expect((await new ApiClient().get(`/api/v1/reading-sets/${id}`)).status).toBe(401);
    expect((await crew.viewer.post("/api/v1/reading-sets", twinSet(engine))).status).toBe(403);
    expect((await crew.viewer.post("/api/v1/reading-sets/preview", twinSet(engine))).status).toBe(403);
    expect((await crew.viewer.post(`/api/v1/reading-sets/${id}/baseline`, { isBaseline: true })).status).toBe(403);
    expect((await other.owner.get(`/api/v1/reading-sets/${id}`)).status).toBe(404);
    expect((await other.owner.post(`/api/v1/reading-sets/${id}/baseline`, { isBaseline: true })).status).toBe(404);
    expect((await other.owner.delete(`/api/v1/reading-sets/${id}`)).status).toBe(404);
    expect((await other.owner.get(`/api/v1/reading-sets?engineId=${engine}`)).body.total).toBe(0);
    const foreign = await other.owner.post("/api/v1/reading-sets", twinSet(engine));
    expect(foreign.status).toBe(400);
    expect(foreign.body.error.fields.engineId).toBeTruthy();
    expect((await testDb()("reading_sets").where({ id }).first()).is_baseline).toBe(0);
  });
});

describe("the demo season", () => {
  it("holds Kestrel Hollow's engines with DEMO.md's drifts, and keeps Larchwind's fleet apart", async () => {
    await clearSignInAttempts();
    const owner = await signedIn(DEMO.owner);
    const roster = await owner.get("/api/v1/engines?perPage=50");
    expect(roster.body.engines.map((e: { name: string }) => e.name)).toEqual(["A-1", "A-2", "A-3", "A-4", "A-5", "A-6", "A-7"]);
    const byName = Object.fromEntries(roster.body.engines.map((e: { name: string }) => [e.name, e]));
    expect(byName["A-4"].counters.topEnd).toMatchObject({ used: 8.4, limit: 10, level: "watch" });
    expect(byName["A-1"].chassis.number).toBe("27");
    const a2 = byName["A-2"].id;
    const sets = (await owner.get(`/api/v1/reading-sets?engineId=${a2}&perPage=50`)).body.readingSets;
    const teardown = sets.find((s: { setKind: string; takenOn: string }) => s.setKind === "teardown");
    // DEMO.md: 23.0 cc after 5.5 h, geometric 13.73 → 14.06, spread 0.5 cc, below the class minimum
    expect(teardown.usageAtReading.sinceTopEnd).toBe(5.5);
    expect(teardown.figures.cylinders[0].geometricRatio).toBeCloseTo(14.06, 2);
    expect(teardown.figures.chamberSpread.spread).toBeCloseTo(0.5, 6);
    expect(teardown.figures.compliance.compliant).toBe(false);
    const a7 = (await owner.get(`/api/v1/reading-sets?engineId=${byName["A-7"].id}&setKind=build`)).body.readingSets;
    expect(a7.some((s: { figures: { chamberSpread: { spread: number } } }) => Math.abs(s.figures.chamberSpread.spread - 0.4) < 1e-6)).toBe(true);
    expect((await owner.get("/api/v1/engines?search=B-")).body.total).toBe(0);

    const nell = await signedIn(DEMO.otherOwner);
    const fleet = await nell.get("/api/v1/engines");
    expect(fleet.body.engines.map((e: { name: string }) => e.name)).toEqual(["B-1", "B-2", "B-3", "B-4"]);
    expect((await nell.get(`/api/v1/engines/${a2}`)).status).toBe(404);
    const b2 = fleet.body.engines[1].id;
    const b2Sets = (await nell.get(`/api/v1/reading-sets?engineId=${b2}&perPage=50`)).body.readingSets;
    const psi = b2Sets.map((s: { cylinders: { crankingKpa: number }[] }) => Math.round(s.cylinders[0].crankingKpa / 6.894757)).reverse();
    expect(psi.slice(0, 4)).toEqual([118, 115, 108, 99]);
  });
});
