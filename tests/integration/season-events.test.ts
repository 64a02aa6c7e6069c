import { beforeAll, beforeEach, describe, expect, it } from "vitest";
import { DEMO, signedIn, type ApiClient } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { createSeasonTeam, SEASON_PASSWORD, shiftDay, todayUtc, type SeasonTeam } from "../factories/season.ts";

// Events with their entries, the shop's settings and closed days, through the API: what is
// saved, what is refused (with the field named), and that a refusal writes nothing.

let team: SeasonTeam;
let manager: ApiClient;
const today = todayUtc();

function eventBody(over: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    name: "Pinewood sprint",
    venue: "Pinewood",
    startsOn: shiftDay(today, 12),
    endsOn: shiftDay(today, 13),
    elevationM: 640,
    expectedAirTempC: -8,
    kind: "race",
    entries: [
      { chassisId: team.chassis.c7, expectedUsage: 1.5 },
      { chassisId: team.chassis.c11, expectedUsage: 1.2 },
    ],
    ...over,
  };
}

beforeAll(async () => {
  await clearSignInAttempts();
  team = await createSeasonTeam(testDb());
  manager = await signedIn(team.emails.manager, SEASON_PASSWORD);
});

beforeEach(async () => {
  await clearSignInAttempts();
});

describe("events and their entries", () => {
  it("creates an event with its entries in one go, reads it back and audits it", async () => {
    const res = await manager.post("/api/v1/events", eventBody());
    expect(res.status).toBe(201);
    expect(res.body.event.name).toBe("Pinewood sprint");
    expect(res.body.event.entries.map((x: { chassisNumber: string; expectedUsage: number }) => [x.chassisNumber, x.expectedUsage]).sort()).toEqual([
      ["11", 1.2],
      ["7", 1.5],
    ]);
    const id = res.body.event.id;
    const detail = await manager.get(`/api/v1/events/${id}`);
    expect(detail.status).toBe(200);
    expect(detail.body.event.elevationM).toBe(640);
    expect(detail.body.event.entries).toHaveLength(2);
    const audit = await testDb()("audit_log").where({ organisation_id: team.orgId, action: "event.created", entity_id: String(id) }).first();
    expect(audit).toBeTruthy();
  });

  it("replaces the entry list on update, keeping the entries whose chassis stay", async () => {
    const created = await manager.post("/api/v1/events", eventBody({ name: "Entry swap" }));
    const id = created.body.event.id;
    const kept = created.body.event.entries.find((x: { chassisId: number }) => x.chassisId === team.chassis.c7);
    await testDb()("event_entries").where({ id: kept.id }).update({ fuel_run: "Race 100, 40:1" });
    const res = await manager.patch(`/api/v1/events/${id}`, { entries: [{ chassisId: team.chassis.c7, expectedUsage: 2 }] });
    expect(res.status).toBe(200);
    expect(res.body.event.entries).toHaveLength(1);
    expect(res.body.event.entries[0].id).toBe(kept.id);
    expect(res.body.event.entries[0].expectedUsage).toBe(2);
    expect(res.body.event.entries[0].fuelRun).toBe("Race 100, 40:1");
  });

  it("refuses an event that ends before it starts, naming endsOn, and saves nothing", async () => {
    const before = await testDb()("events").where({ organisation_id: team.orgId }).count<{ n: number }[]>({ n: "*" }).first();
    const res = await manager.post("/api/v1/events", eventBody({ name: "Backwards", startsOn: shiftDay(today, 20), endsOn: shiftDay(today, 18) }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields.endsOn).toMatch(/end before it starts/);
    const after = await testDb()("events").where({ organisation_id: team.orgId }).count<{ n: number }[]>({ n: "*" }).first();
    expect(Number(after?.n)).toBe(Number(before?.n));
  });

  it("refuses an update that would make a stored event end before it starts", async () => {
    const created = await manager.post("/api/v1/events", eventBody({ name: "Short one" }));
    const res = await manager.patch(`/api/v1/events/${created.body.event.id}`, { endsOn: shiftDay(today, 5) });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.endsOn).toBeTruthy();
    const row = await testDb()("events").where({ id: created.body.event.id }).first();
    expect(row.ends_on).toBe(shiftDay(today, 13));
  });

  it("refuses negative or zero usage and a day that does not exist, naming each field", async () => {
    const res = await manager.post("/api/v1/events", eventBody({ name: "Bad usage", startsOn: "2027-02-30", entries: [{ chassisId: team.chassis.c7, expectedUsage: -1.5 }, { chassisId: team.chassis.c11, expectedUsage: 0 }] }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields["entries.0.expectedUsage"]).toMatch(/more than zero/);
    expect(res.body.error.fields["entries.1.expectedUsage"]).toBeTruthy();
    expect(res.body.error.fields.startsOn).toBeTruthy();
    expect(await testDb()("events").where({ organisation_id: team.orgId, name: "Bad usage" }).first()).toBeUndefined();
  });

  it("refuses another organisation's chassis and a chassis entered twice, writing no half event", async () => {
    const other = await createSeasonTeam(testDb());
    const res = await manager.post("/api/v1/events", eventBody({ name: "Foreign chassis", entries: [{ chassisId: other.chassis.c7, expectedUsage: 1 }, { chassisId: team.chassis.c11, expectedUsage: 1 }, { chassisId: team.chassis.c11, expectedUsage: 1 }] }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields["entries.0.chassisId"]).toBeTruthy();
    expect(res.body.error.fields["entries.2.chassisId"]).toMatch(/already entered/);
    expect(await testDb()("events").where({ organisation_id: team.orgId, name: "Foreign chassis" }).first()).toBeUndefined();
  });

  it("archives an event instead of deleting it, and lists it only when asked", async () => {
    const created = await manager.post("/api/v1/events", eventBody({ name: "Called off" }));
    const del = await manager.delete(`/api/v1/events/${created.body.event.id}`);
    expect(del.status).toBe(200);
    expect(del.body.event.archived).toBe(true);
    const list = await manager.get("/api/v1/events");
    expect(list.body.events.some((e: { name: string }) => e.name === "Called off")).toBe(false);
    const all = await manager.get("/api/v1/events?includeArchived=true");
    expect(all.body.events.some((e: { name: string }) => e.name === "Called off")).toBe(true);
  });
});

describe("who may change events", () => {
  it("lets a viewer and a mechanic read events but not write them", async () => {
    const created = await manager.post("/api/v1/events", eventBody({ name: "Read only" }));
    for (const role of ["viewer", "mechanic", "crew_chief"] as const) {
      const c = await signedIn(team.emails[role], SEASON_PASSWORD);
      expect((await c.get(`/api/v1/events/${created.body.event.id}`)).status).toBe(200);
      expect((await c.post("/api/v1/events", eventBody({ name: `By ${role}` }))).status).toBe(403);
      expect((await c.patch(`/api/v1/events/${created.body.event.id}`, { name: "Renamed" })).status).toBe(403);
      expect((await c.delete(`/api/v1/events/${created.body.event.id}`)).status).toBe(403);
    }
    expect((await testDb()("events").where({ id: created.body.event.id }).first()).name).toBe("Read only");
  });

  it("answers 404 to another organisation, as for an unknown id", async () => {
    const created = await manager.post("/api/v1/events", eventBody({ name: "Private" }));
    const outsider = await signedIn(DEMO.otherOwner);
    expect((await outsider.get(`/api/v1/events/${created.body.event.id}`)).status).toBe(404);
    expect((await outsider.patch(`/api/v1/events/${created.body.event.id}`, { name: "Mine" })).status).toBe(404);
    expect((await outsider.delete(`/api/v1/events/${created.body.event.id}`)).status).toBe(404);
    expect((await manager.get("/api/v1/events/999999999")).status).toBe(404);
  });
});

describe("the shop", () => {
  it("saves hours per weekday and job lengths, closes and reopens a day, and refuses bad values", async () => {
    const settings = { hoursPerWeekday: [8, 8, 8, 8, 4, 0, 0], travelDaysBeforeEvent: 2, topEndHours: 3.5, bottomEndHours: 11, inspectionHours: 1, partsLeadDays: 5 };
    const saved = await manager.patch("/api/v1/shop", settings);
    expect(saved.status).toBe(200);
    expect(saved.body.shop).toEqual({ ...settings, isDefault: false });
    const day = shiftDay(today, 40);
    const closed = await manager.post("/api/v1/shop", { day, reason: "Team dinner" });
    expect(closed.status).toBe(201);
    expect(closed.body.closedDays.some((d: { day: string }) => d.day === day)).toBe(true);
    expect((await manager.post("/api/v1/shop", { day })).status).toBe(409);
    const opened = await manager.delete(`/api/v1/shop?day=${day}`);
    expect(opened.status).toBe(200);
    expect(opened.body.closedDays.some((d: { day: string }) => d.day === day)).toBe(false);
    const bad = await manager.patch("/api/v1/shop", { ...settings, hoursPerWeekday: [8, -1, 8, 8, 8, 0] });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).some((f) => f.startsWith("hoursPerWeekday"))).toBe(true);
    const row = await testDb()("shop_settings").where({ organisation_id: team.orgId }).first();
    expect(Number(row.top_end_hours)).toBe(3.5);
    // Put the factory's shop back for the other files' assumptions about this team.
    await manager.patch("/api/v1/shop", { hoursPerWeekday: [6, 6, 6, 6, 6, 6, 6], travelDaysBeforeEvent: 1, topEndHours: 4, bottomEndHours: 12, inspectionHours: 1.5, partsLeadDays: 3 });
  });

  it("lets only managers and owners change the shop", async () => {
    const mechanic = await signedIn(team.emails.mechanic, SEASON_PASSWORD);
    expect((await mechanic.get("/api/v1/shop")).status).toBe(200);
    expect((await mechanic.patch("/api/v1/shop", { hoursPerWeekday: [1, 1, 1, 1, 1, 1, 1], travelDaysBeforeEvent: 0, topEndHours: 1, bottomEndHours: 1, inspectionHours: 1, partsLeadDays: 0 })).status).toBe(403);
    expect((await mechanic.post("/api/v1/shop", { day: shiftDay(today, 3) })).status).toBe(403);
    const owner = await signedIn(team.emails.owner, SEASON_PASSWORD);
    expect((await owner.post("/api/v1/shop", { day: shiftDay(today, 41), reason: "Owner's call" })).status).toBe(201);
  });
});
