import { beforeAll, beforeEach, describe, expect, it } from "vitest";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { createReadingSet } from "../factories/motors.ts";
import { createCrew, engineIn, type Crew } from "./motors-fixtures.ts";

// The Motors pages' own routes: an engine's signal thresholds (a crew chief's override, checked
// by the signal rules' own validation) and the open-signal counts of the roster; the build
// sheet's PDF and the engine file answering 404 across organisations.

let crew: Crew;
let other: Crew;
let engineId: number;
let otherEngineId: number;

beforeAll(async () => {
  crew = await createCrew();
  other = await createCrew();
  engineId = await engineIn(crew.orgId, { status: "running" });
  otherEngineId = await engineIn(other.orgId, { status: "running" });
  await createReadingSet(testDb(), crew.orgId, {
    engineId,
    takenOn: "2026-11-01",
    elevationM: 366,
    isBaseline: true,
    cylinders: [
      { cylinderNo: 1, chamberReadingsCc: [23.6, 23.6], squishAMm: 1.2, squishBMm: 1.21 },
      { cylinderNo: 2, chamberReadingsCc: [23.6, 23.6], squishAMm: 1.2, squishBMm: 1.2 },
    ],
  });
});
beforeEach(async () => {
  await clearSignInAttempts();
});

describe("PATCH /api/v1/engines/[id]/thresholds", () => {
  it("lets a crew chief lay the engine's own values over the organisation's, and stores only what differs", async () => {
    const res = await crew.chief.patch(`/api/v1/engines/${engineId}/thresholds`, { thresholds: { chamber: { watchDropPct: 2, actDropPct: 3 } } });
    expect(res.status).toBe(200);
    // actDropPct 3 is the organisation's default (TRADE.md), so only the watch level is the engine's own.
    expect(res.body.overrides).toEqual({ chamber: { watchDropPct: 2 } });
    expect(res.body.effective.chamber).toEqual({ watchDropPct: 2, actDropPct: 3 });
    expect(res.body.organisation.chamber.watchDropPct).toBe(1.5);
    const row = await testDb()("engines").where({ id: engineId }).first("signal_thresholds");
    const stored = typeof row.signal_thresholds === "string" ? JSON.parse(row.signal_thresholds) : row.signal_thresholds;
    expect(stored).toEqual({ chamber: { watchDropPct: 2 } });
    const audit = await testDb()("audit_log").where({ organisation_id: crew.orgId, action: "engine.thresholds_set", entity_id: String(engineId) });
    expect(audit).toHaveLength(1);
  });

  it("refuses an act level below its watch level, an unknown threshold and a non-positive value, naming the field", async () => {
    const below = await crew.chief.patch(`/api/v1/engines/${engineId}/thresholds`, { thresholds: { squish: { watchMm: 0.2 } } });
    expect(below.status).toBe(400);
    expect(Object.keys(below.body.error.fields)).toEqual(["thresholds.squish.actDownMm"]);
    const unknown = await crew.chief.patch(`/api/v1/engines/${engineId}/thresholds`, { thresholds: { chamber: { sometimesPct: 2 } } });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields).toHaveProperty(["thresholds.chamber.sometimesPct"]);
    const zero = await crew.chief.patch(`/api/v1/engines/${engineId}/thresholds`, { thresholds: { chamber: { watchDropPct: 0 } } });
    expect(zero.status).toBe(400);
    expect(zero.body.error.fields).toHaveProperty(["thresholds.chamber.watchDropPct"]);
    // Nothing of the refused requests was kept.
    expect((await crew.chief.get(`/api/v1/engines/${engineId}/thresholds`)).body.overrides).toEqual({ chamber: { watchDropPct: 2 } });
  });

  it("lets the engine follow the organisation again with null", async () => {
    const res = await crew.chief.patch(`/api/v1/engines/${engineId}/thresholds`, { thresholds: null });
    expect(res.status).toBe(200);
    expect(res.body.overrides).toBeNull();
    expect((await testDb()("engines").where({ id: engineId }).first("signal_thresholds")).signal_thresholds).toBeNull();
  });

  it("is a crew chief's, manager's or owner's call; others may read; another organisation gets 404", async () => {
    const body = { thresholds: { chamber: { watchDropPct: 2 } } };
    expect((await crew.mechanic.patch(`/api/v1/engines/${engineId}/thresholds`, body)).status).toBe(403);
    expect((await crew.viewer.patch(`/api/v1/engines/${engineId}/thresholds`, body)).status).toBe(403);
    expect((await crew.manager.patch(`/api/v1/engines/${engineId}/thresholds`, { thresholds: null })).status).toBe(200);
    expect((await crew.viewer.get(`/api/v1/engines/${engineId}/thresholds`)).status).toBe(200);
    expect((await other.chief.patch(`/api/v1/engines/${engineId}/thresholds`, body)).status).toBe(404);
    expect((await other.viewer.get(`/api/v1/engines/${engineId}/thresholds`)).status).toBe(404);
  });
});

describe("GET /api/v1/motors-ui/signal-counts", () => {
  it("counts open and acknowledged signals per engine and level, never resolved ones or another organisation's", async () => {
    const now = new Date();
    const base = { organisation_id: crew.orgId, engine_id: engineId, numbers: "{}", message: "test", opened_at: now };
    await testDb()("signals").insert([
      { ...base, signal_key: `${engineId}:drift:1:chamber`, kind: "drift", severity: "act", state: "open" },
      { ...base, signal_key: `${engineId}:spread:engine:chamber`, kind: "spread", severity: "watch", state: "acknowledged" },
      { ...base, signal_key: `${engineId}:drift:2:chamber`, kind: "drift", severity: "watch", state: "resolved", resolved_at: now },
      { ...base, organisation_id: other.orgId, engine_id: otherEngineId, signal_key: `${otherEngineId}:drift:1:chamber`, kind: "drift", severity: "act", state: "open" },
    ]);
    const res = await crew.chief.get(`/api/v1/motors-ui/signal-counts?engineIds=${engineId},${otherEngineId}`);
    expect(res.status).toBe(200);
    expect(res.body.counts).toEqual({ [String(engineId)]: { watch: 1, act: 1 } });
    const all = await crew.mechanic.get("/api/v1/motors-ui/signal-counts");
    expect(all.body.counts[String(engineId)]).toEqual({ watch: 1, act: 1 });
    expect(all.body.counts[String(otherEngineId)]).toBeUndefined();
  });

  it("refuses viewers (who do not see signals) and a malformed list", async () => {
    expect((await crew.viewer.get("/api/v1/motors-ui/signal-counts")).status).toBe(403);
    const bad = await crew.chief.get("/api/v1/motors-ui/signal-counts?engineIds=1,two");
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty("engineIds");
  });
});

describe("engine file pages", () => {
  it("serves the build sheet as PDF to any member, and 404 to another organisation", async () => {
    const res = await crew.viewer.request("GET", `/motors/${engineId}/sheet.pdf`);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(String(res.body).slice(0, 5)).toBe("%PDF-");
    expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="build-sheet-/);
    expect((await other.owner.request("GET", `/motors/${engineId}/sheet.pdf`)).status).toBe(404);
    expect((await other.owner.request("GET", `/motors/${engineId}`)).status).toBe(404);
    expect((await other.owner.request("GET", `/motors/${engineId}/sheet`)).status).toBe(404);
    expect((await other.owner.request("GET", `/motors/${engineId}/readings/new`)).status).toBe(404);
  });

  it("keeps the reading form and the import from viewers", async () => {
    expect((await crew.viewer.request("GET", `/motors/${engineId}/readings/new`)).status).toBe(403);
    expect((await crew.viewer.request("GET", "/motors/import")).status).toBe(403);
    expect((await crew.viewer.request("GET", `/motors/${engineId}`)).status).toBe(200);
    expect((await crew.mechanic.request("GET", `/motors/${engineId}/readings/new?baseline=1`)).status).toBe(200);
  });
});
