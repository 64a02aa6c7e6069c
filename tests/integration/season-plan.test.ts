import { beforeAll, beforeEach, describe, expect, it } from "vitest";
import { loadEngineCounters } from "../../src/db/counters-repo.ts";
import { DEMO, signedIn, type ApiClient } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { createReadingSet } from "../factories/motors.ts";
import { createSeasonTeam, SEASON_PASSWORD, shiftDay, todayUtc, type SeasonTeam } from "../factories/season.ts";

// The plan through the API, on a team whose hours are known (see tests/factories/season.ts):
// E1 in chassis 7 has 2 h left, E2 in 11 has 4 h, E3 (spare) 0.5 h; the shop works 6 h a day,
// a top end takes 4 h and parts arrive 3 days after ordering. Events: Ev0 tomorrow (chassis 7),
// Ev1 in 10–11 days and Ev2 in 20–21 days (chassis 7 and 11), 1.5 h per entry.
// Worked by hand: 5 entries × 1.5 h need 7.5 h; the engines can run 1 + 2 + 0 = 3 entries
// as they stand, so the plan needs at least one top end. The planner renews E3 (0.5 h left,
// throws away the least) on day 8, as late as the shop allows before Ev1 (day 9 is travel).

let team: SeasonTeam;
let manager: ApiClient;
const today = todayUtc();
const ids: { ev0: number; ev1: number; ev2: number; ev0c7: number } = { ev0: 0, ev1: 0, ev2: 0, ev0c7: 0 };

async function makeEvent(name: string, from: number, to: number, chassis: number[]): Promise<{ id: number; entries: { id: number; chassisId: number }[] }> {
  const res = await manager.post("/api/v1/events", {
    name,
    startsOn: shiftDay(today, from),
    endsOn: shiftDay(today, to),
    elevationM: 500,
    expectedAirTempC: -10,
    kind: "race",
    entries: chassis.map((chassisId) => ({ chassisId, expectedUsage: 1.5 })),
  });
  expect(res.status).toBe(201);
  return res.body.event;
}

async function plannedJobs(): Promise<{ id: number; engine_id: number; kind: string; starts_on: string; pinned: number; state: string }[]> {
  return testDb()("jobs").where({ organisation_id: team.orgId }).whereNot("state", "cancelled").orderBy("starts_on");
}

beforeAll(async () => {
  await clearSignInAttempts();
  team = await createSeasonTeam(testDb());
  manager = await signedIn(team.emails.manager, SEASON_PASSWORD);
  const ev0 = await makeEvent("Ev0", 1, 1, [team.chassis.c7]);
  const ev1 = await makeEvent("Ev1", 10, 11, [team.chassis.c7, team.chassis.c11]);
  const ev2 = await makeEvent("Ev2", 20, 21, [team.chassis.c7, team.chassis.c11]);
  Object.assign(ids, { ev0: ev0.id, ev1: ev1.id, ev2: ev2.id, ev0c7: ev0.entries[0].id });
});

beforeEach(async () => {
  await clearSignInAttempts();
});

describe("re-planning the season", () => {
  it("shows an unplanned season as out of date until a plan is accepted", async () => {
    const res = await manager.get("/api/v1/plan");
    expect(res.status).toBe(200);
    expect(res.body.plannedAt).toBeNull();
    expect(res.body.checks.some((c: string) => /has no engine in the accepted plan/.test(c))).toBe(true);
    expect(res.body.events.map((e: { name: string }) => e.name)).toEqual(["Ev0", "Ev1", "Ev2"]);
  });

  it("previews a re-plan without writing anything, then accepts exactly that plan", async () => {
    const preview = await manager.post("/api/v1/plan", { accept: false });
    expect(preview.status).toBe(200);
    expect(preview.body.accepted).toBe(false);
    const diff = preview.body.diff;
    expect(diff.assignments).toHaveLength(5);
    expect(diff.assignments.every((a: { from: string | null }) => a.from === null)).toBe(true);
    expect(diff.jobsAdded).toEqual([expect.objectContaining({ engineName: "E3", kind: "top_end", startsOn: shiftDay(today, 8), forEventName: "Ev1" })]);
    expect(diff.conflicts).toEqual([]);
    expect(await plannedJobs()).toEqual([]);
    expect(await testDb()("event_entries").where({ event_id: ids.ev1 }).whereNotNull("engine_id").first()).toBeUndefined();

    const accepted = await manager.post("/api/v1/plan", { accept: true, basis: diff.basis });
    expect(accepted.status).toBe(200);
    expect(accepted.body.accepted).toBe(true);
    const jobs = await plannedJobs();
    expect(jobs).toHaveLength(1);
    expect(jobs[0]).toMatchObject({ engine_id: team.engines.e3, kind: "top_end", starts_on: shiftDay(today, 8), state: "planned" });
    const entries = await testDb()("event_entries").whereIn("event_id", [ids.ev0, ids.ev1, ids.ev2]).whereNull("engine_id");
    expect(entries).toEqual([]);
    const plan = await manager.get("/api/v1/plan");
    expect(plan.body.checks).toEqual([]);
    expect(plan.body.stats).toMatchObject({ rebuildCount: 1, entryCount: 5, assignedCount: 5 });
    expect(plan.body.explanations.jobs[String(jobs[0].id)]).toMatch(/^Top end before the \d+ \w+ event \(Ev1\)/);
    expect(await testDb()("audit_log").where({ organisation_id: team.orgId, action: "plan.accepted" }).first()).toBeTruthy();
  });

  it("refuses to accept a plan when something changed since the preview", async () => {
    const preview = await manager.post("/api/v1/plan", { accept: false });
    expect(preview.body.diff.unchanged).toBe(true);
    await testDb()("usage_entries").insert({ organisation_id: team.orgId, engine_id: team.engines.e2, occurred_on: today, amount: 0.25, source: "manual" });
    const res = await manager.post("/api/v1/plan", { accept: true, basis: preview.body.diff.basis });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/changed since the preview/);
    await testDb()("usage_entries").where({ organisation_id: team.orgId, engine_id: team.engines.e2, occurred_on: today }).delete();
  });
});

describe("pins", () => {
  it("refuses a pin that breaks a hard rule with the planner's reason, saving nothing", async () => {
    const plansBefore = await testDb()("season_plans").where({ organisation_id: team.orgId }).count<{ n: number }[]>({ n: "*" }).first();
    const res = await manager.patch(`/api/v1/events/${ids.ev0}/entries/${ids.ev0c7}`, { engineId: team.engines.e3 });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/pin of E3 to chassis 7 at the Ev0 event cannot hold: it has 0\.5 h left, the top end needs 4 h/);
    const entry = await testDb()("event_entries").where({ id: ids.ev0c7 }).first();
    expect(Boolean(entry.engine_pinned)).toBe(false);
    expect(entry.engine_id).not.toBe(team.engines.e3);
    const plansAfter = await testDb()("season_plans").where({ organisation_id: team.orgId }).count<{ n: number }[]>({ n: "*" }).first();
    expect(Number(plansAfter?.n)).toBe(Number(plansBefore?.n));
  });

  it("holds a pin that fits and re-plans around it", async () => {
    const res = await manager.patch(`/api/v1/events/${ids.ev0}/entries/${ids.ev0c7}`, { engineId: team.engines.e1 });
    expect(res.status).toBe(200);
    const entry = await testDb()("event_entries").where({ id: ids.ev0c7 }).first();
    expect(entry).toMatchObject({ engine_id: team.engines.e1 });
    expect(Boolean(entry.engine_pinned)).toBe(true);
    const plan = await manager.get("/api/v1/plan");
    expect(plan.body.checks).toEqual([]);
    const unpin = await manager.patch(`/api/v1/events/${ids.ev0}/entries/${ids.ev0c7}`, { engineId: null });
    expect(unpin.status).toBe(200);
    await manager.post("/api/v1/plan", { accept: true });
  });
});

describe("dragging a job", () => {
  it("refuses a move onto a closed day with the reason, and changes nothing", async () => {
    const [job] = await plannedJobs();
    expect((await manager.post("/api/v1/shop", { day: shiftDay(today, 6), reason: "Stock-take" })).status).toBe(201);
    const res = await manager.post(`/api/v1/jobs/${job.id}`, { startsOn: shiftDay(today, 6) });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/cannot hold: the shop is closed that day/);
    expect(await plannedJobs()).toEqual([job]);
  });

  it("refuses a move onto an event day, before the parts can arrive, or into the past", async () => {
    const [job] = await plannedJobs();
    const onEvent = await manager.post(`/api/v1/jobs/${job.id}`, { startsOn: shiftDay(today, 10) });
    expect(onEvent.status).toBe(409);
    expect(onEvent.body.error.message).toMatch(/event day \(Ev1\)/);
    const early = await manager.post(`/api/v1/jobs/${job.id}`, { startsOn: shiftDay(today, 2) });
    expect(early.status).toBe(409);
    expect(early.body.error.message).toMatch(/parts ordered today arrive/);
    const past = await manager.post(`/api/v1/jobs/${job.id}`, { startsOn: shiftDay(today, -1) });
    expect(past.status).toBe(409);
    expect(await plannedJobs()).toEqual([job]);
  });

  it("accepts a move the shop can take, pins the job there and re-plans the rest", async () => {
    const [job] = await plannedJobs();
    const res = await manager.post(`/api/v1/jobs/${job.id}`, { startsOn: shiftDay(today, 5) });
    expect(res.status).toBe(200);
    expect(res.body.accepted).toBe(true);
    expect(res.body.diff.jobsMoved).toEqual([expect.objectContaining({ engineName: "E3", startsOn: shiftDay(today, 5), fromStartsOn: shiftDay(today, 8) })]);
    const jobs = await plannedJobs();
    expect(jobs).toHaveLength(1);
    expect(jobs[0]).toMatchObject({ id: job.id, starts_on: shiftDay(today, 5) });
    expect(Boolean(jobs[0].pinned)).toBe(true);
    const latest = await testDb()("season_plans").where({ organisation_id: team.orgId }).orderBy("id", "desc").first();
    expect(latest.cause).toBe("move");
    const plan = await manager.get("/api/v1/plan");
    expect(plan.body.checks).toEqual([]);
  });
});

describe("the bench", () => {
  it("lets a mechanic start and finish a job: services rows for the kind and what it renews, counters reset, baseline asked for", async () => {
    const mechanic = await signedIn(team.emails.mechanic, SEASON_PASSWORD);
    const [job] = await plannedJobs();
    const before = (await loadEngineCounters(team.orgId, [team.engines.e3], testDb())).get(team.engines.e3);
    expect(before?.sinceTopEnd).toBe(7.5);
    const started = await mechanic.patch(`/api/v1/jobs/${job.id}`, { state: "in_progress" });
    expect(started.status).toBe(200);
    expect(started.body.job.state).toBe("in_progress");
    expect(started.body.job.assignedTo.name).toMatch(/^mechanic/);
    // Started early: the job keeps its length and now starts today.
    expect(started.body.job.startsOn).toBe(today);
    expect(Object.keys(started.body.job.hoursByDate)).toEqual([today]);
    const checklist = started.body.job.checklist.map((c: { item: string }) => ({ item: c.item, done: true }));
    const done = await mechanic.patch(`/api/v1/jobs/${job.id}`, {
      state: "done",
      doneOn: today,
      labourHoursActual: 4.5,
      checklist,
      parts: [{ description: "Piston kit, 72.00 mm", quantity: 2 }, { description: "Gasket set", quantity: 1 }],
    });
    expect(done.status).toBe(200);
    expect(done.body.job).toMatchObject({ state: "done", doneOn: today, labourHoursActual: 4.5 });
    expect(done.body.job.parts).toHaveLength(2);
    expect(done.body.baselinePrompt).toEqual({ engineId: team.engines.e3, engineName: "E3", kind: "top_end", doneOn: today, href: `/motors/${team.engines.e3}/readings/new?baseline=1` });
    const services = await testDb()("services").where({ job_id: job.id });
    expect(services.map((s) => s.kind).sort()).toEqual(["inspection", "top_end"]);
    expect(services.every((s) => s.done_on === today && s.engine_id === team.engines.e3)).toBe(true);
    const after = (await loadEngineCounters(team.orgId, [team.engines.e3], testDb())).get(team.engines.e3);
    expect(after).toMatchObject({ sinceTopEnd: 0, sinceInspection: 0, sinceBottomEnd: 12, lastTopEndOn: today });
    expect(await testDb()("audit_log").where({ organisation_id: team.orgId, action: "job.finished", entity_id: String(job.id) }).first()).toBeTruthy();
    const again = await mechanic.patch(`/api/v1/jobs/${job.id}`, { state: "in_progress" });
    expect(again.status).toBe(409);
    const bench = await mechanic.get(`/api/v1/jobs/${job.id}`);
    expect(bench.body.job.state).toBe("done");
  });

  it("refuses a finish dated in the future and a part from another organisation, writing nothing", async () => {
    const add = await manager.post("/api/v1/jobs", { engineId: team.engines.e2, kind: "inspection", startsOn: shiftDay(today, 4) });
    expect(add.status).toBe(201);
    const job = (await plannedJobs()).find((j) => j.engine_id === team.engines.e2 && j.kind === "inspection");
    expect(job).toBeTruthy();
    const mechanic = await signedIn(team.emails.mechanic, SEASON_PASSWORD);
    const future = await mechanic.patch(`/api/v1/jobs/${job!.id}`, { state: "done", doneOn: shiftDay(today, 3) });
    expect(future.status).toBe(400);
    expect(future.body.error.fields.doneOn).toBeTruthy();
    const other = await createSeasonTeam(testDb());
    const [foreignPart] = await testDb()("parts").insert({ organisation_id: other.orgId, serial: `X-${Date.now()}`, kind: "piston" });
    const badPart = await mechanic.patch(`/api/v1/jobs/${job!.id}`, { state: "done", parts: [{ partId: foreignPart, description: "Borrowed", quantity: 1 }] });
    expect(badPart.status).toBe(400);
    expect(badPart.body.error.fields["parts.0.partId"]).toBeTruthy();
    expect(await testDb()("services").where({ job_id: job!.id }).first()).toBeUndefined();
    expect((await testDb()("jobs").where({ id: job!.id }).first()).state).toBe("planned");
  });
});

describe("roles", () => {
  it("lets a mechanic work jobs but not plan", async () => {
    const mechanic = await signedIn(team.emails.mechanic, SEASON_PASSWORD);
    const [job] = (await plannedJobs()).filter((j) => j.state === "planned");
    expect((await mechanic.get("/api/v1/plan")).status).toBe(200);
    expect((await mechanic.post("/api/v1/plan", { accept: false })).status).toBe(403);
    expect((await mechanic.post(`/api/v1/jobs/${job.id}`, { startsOn: shiftDay(today, 6) })).status).toBe(403);
    expect((await mechanic.patch(`/api/v1/events/${ids.ev1}/entries/${ids.ev0c7}`, { engineId: team.engines.e1 })).status).toBe(403);
    expect((await mechanic.patch(`/api/v1/jobs/${job.id}`, { notes: "Parts on the shelf" })).status).toBe(200);
    expect((await mechanic.patch(`/api/v1/jobs/${job.id}`, { state: "cancelled" })).status).toBe(403);
  });

  it("lets a crew chief record the fuel run, and nobody below", async () => {
    const chief = await signedIn(team.emails.crew_chief, SEASON_PASSWORD);
    const res = await chief.post(`/api/v1/events/${ids.ev0}/entries/${ids.ev0c7}`, { fuelRun: "Race 100, 40:1, can 3" });
    expect(res.status).toBe(200);
    const entry = res.body.event.entries.find((x: { id: number }) => x.id === ids.ev0c7);
    expect(entry.fuelRun).toBe("Race 100, 40:1, can 3");
    expect(entry.fuelDecidedBy.name).toMatch(/^crew_chief/);
    expect((await chief.post("/api/v1/plan", { accept: false })).status).toBe(403);
    for (const role of ["mechanic", "viewer"] as const) {
      const c = await signedIn(team.emails[role], SEASON_PASSWORD);
      expect((await c.post(`/api/v1/events/${ids.ev0}/entries/${ids.ev0c7}`, { fuelRun: "Pump 91" })).status).toBe(403);
    }
    const empty = await chief.post(`/api/v1/events/${ids.ev0}/entries/${ids.ev0c7}`, { fuelRun: "  " });
    expect(empty.status).toBe(400);
    expect((await testDb()("event_entries").where({ id: ids.ev0c7 }).first()).fuel_run).toBe("Race 100, 40:1, can 3");
  });

  it("gives a viewer the plan and refuses every write", async () => {
    const viewer = await signedIn(team.emails.viewer, SEASON_PASSWORD);
    const [job] = await plannedJobs();
    expect((await viewer.get("/api/v1/plan")).status).toBe(200);
    expect((await viewer.get("/api/v1/jobs")).status).toBe(200);
    expect((await viewer.post("/api/v1/plan", { accept: true })).status).toBe(403);
    expect((await viewer.patch(`/api/v1/jobs/${job.id}`, { notes: "x" })).status).toBe(403);
    expect((await viewer.post(`/api/v1/jobs/${job.id}`, { startsOn: shiftDay(today, 6) })).status).toBe(403);
    expect((await viewer.post("/api/v1/jobs", { engineId: team.engines.e1, kind: "inspection", startsOn: shiftDay(today, 4) })).status).toBe(403);
  });

  it("answers 404 to another organisation for jobs, entries and event details", async () => {
    const outsider = await signedIn(DEMO.otherOwner);
    const [job] = await plannedJobs();
    expect((await outsider.get(`/api/v1/jobs/${job.id}`)).status).toBe(404);
    expect((await outsider.patch(`/api/v1/jobs/${job.id}`, { notes: "mine" })).status).toBe(404);
    expect((await outsider.post(`/api/v1/jobs/${job.id}`, { startsOn: shiftDay(today, 6) })).status).toBe(404);
    expect((await outsider.patch(`/api/v1/events/${ids.ev0}/entries/${ids.ev0c7}`, { engineId: null })).status).toBe(404);
    expect((await outsider.post(`/api/v1/events/${ids.ev0}/entries/${ids.ev0c7}`, { fuelRun: "x" })).status).toBe(404);
  });
});

describe("the fuel check on an event", () => {
  it("checks each engine with its latest accepted chamber volume, with the cautions, and says when it cannot", async () => {
    const entries = await testDb()("event_entries as x").join("engines as e", "e.id", "x.engine_id").where("x.event_id", ids.ev1).select("x.chassis_id", "e.id", "e.name");
    expect(entries).toHaveLength(2);
    const measured = entries.find((x) => x.chassis_id === team.chassis.c7);
    const unmeasured = entries.find((x) => x.chassis_id === team.chassis.c11);
    await createReadingSet(testDb(), team.orgId, {
      engineId: measured.id,
      takenOn: shiftDay(today, -20),
      elevationM: 366,
      setKind: "build",
      isBaseline: true,
      // Cylinder 2's readings stand 0.5 cc apart (tolerance 0.2 cc): unconfirmed, so the check
      // uses cylinder 1's accepted volume, not the smaller unconfirmed one.
      cylinders: [
        { cylinderNo: 1, chamberReadingsCc: [23.6, 23.7] },
        { cylinderNo: 2, chamberReadingsCc: [23.0, 23.5] },
      ],
    });
    const res = await manager.get(`/api/v1/events/${ids.ev1}`);
    expect(res.status).toBe(200);
    const checks = res.body.fuelChecks as { engineName: string; check: any; note: string | null }[];
    const good = checks.find((f) => f.engineName === measured.name);
    expect(good?.check.chamberCc).toBeCloseTo(23.65, 9); // (23.6 + 23.7) / 2; cylinder 2 unconfirmed
    expect(good?.check.ratioBasis).toBe("trapped");
    expect(good?.check.crankingKpaEstimate).toBeGreaterThan(0);
    expect(good?.check.fuelGrade).toEqual(expect.any(String));
    const none = checks.find((f) => f.engineName === unmeasured.name);
    if (unmeasured.id !== measured.id) {
      expect(none?.check).toBeNull();
      expect(none?.note).toMatch(/No accepted chamber volume/);
    }
    expect(res.body.cautions.some((c: string) => /Detonation/.test(c))).toBe(true);
    expect(res.body.cautions.some((c: string) => /fire codes/.test(c))).toBe(true);
    expect(res.body.cautions.some((c: string) => /seed fuel table/.test(c))).toBe(true);
  });
});
