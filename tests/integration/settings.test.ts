import { beforeEach, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { addMember, createOrganisation, createUser, uniqueSuffix } from "../factories/people.ts";
import { acquireLease } from "../../src/server/jobs/lease.ts";

beforeEach(async () => {
  await clearSignInAttempts();
});

async function freshOwner() {
  const s = uniqueSuffix();
  const orgId = await createOrganisation(testDb(), { name: `Settings ${s}`, slug: `settings-${s}` });
  const email = `settings-${s}@test.example`;
  const id = await createUser(testDb(), { email, name: "Owner", password: "a-long-test-password" });
  await addMember(testDb(), orgId, id, "owner");
  return { orgId, client: await signedIn(email, "a-long-test-password") };
}

describe("organisation settings", () => {
  it("saves general settings, stores only thresholds that differ from the defaults, and audits", async () => {
    const { orgId, client } = await freshOwner();
    const res = await client.patch("/api/v1/settings", {
      general: { timeZone: "Europe/Oslo", shopElevationM: 1200 },
      signals: { schedule: "30 5 * * 1-5", thresholds: { chamber: { watchDropPct: 2, actDropPct: 3 } } },
    });
    expect(res.status).toBe(200);
    expect(res.body.settings.timeZone).toBe("Europe/Oslo");
    expect(res.body.settings.thresholds.chamber.watchDropPct).toBe(2);
    const row = await testDb()("organisations").where({ id: orgId }).first();
    const stored = typeof row.signal_thresholds === "string" ? JSON.parse(row.signal_thresholds) : row.signal_thresholds;
    expect(stored).toEqual({ chamber: { watchDropPct: 2 } }); // 3 % is the default act level
    expect(row.signal_schedule).toBe("30 5 * * 1-5");
    expect(await testDb()("audit_log").where({ organisation_id: orgId, action: "settings.changed" }).first()).toBeTruthy();
  });

  it("refuses a bad schedule, an unknown time zone and a watch level beyond its act level, changing nothing", async () => {
    const { orgId, client } = await freshOwner();
    const before = await testDb()("organisations").where({ id: orgId }).first();
    const tz = await client.patch("/api/v1/settings", { general: { timeZone: "Mars/Olympus" } });
    expect(tz.status).toBe(400);
    expect(tz.body.error.fields["general.timeZone"]).toBeTruthy();
    const cron = await client.patch("/api/v1/settings", { signals: { schedule: "every morning" } });
    expect(cron.status).toBe(400);
    expect(cron.body.error.fields["signals.schedule"]).toBeTruthy();
    const order = await client.patch("/api/v1/settings", { signals: { thresholds: { chamber: { watchDropPct: 5, actDropPct: 3 } } } });
    expect(order.status).toBe(400);
    const after = await testDb()("organisations").where({ id: orgId }).first();
    expect(after.signal_schedule).toBe(before.signal_schedule);
    expect(after.signal_thresholds).toBe(before.signal_thresholds);
    expect(after.time_zone).toBe(before.time_zone);
  });

  it("stores a fuel table in rising order and refuses duplicate bounds", async () => {
    const { client } = await freshOwner();
    const ok = await client.patch("/api/v1/settings", {
      fuelTable: { label: "Our table", rows: [{ upToCrankingKpa: 1100, grade: "Race 100" }, { upToCrankingKpa: 900, grade: "Pump 93" }] },
    });
    expect(ok.status).toBe(200);
    expect(ok.body.settings.fuelTable.rows.map((r: { grade: string }) => r.grade)).toEqual(["Pump 93", "Race 100"]);
    const dup = await client.patch("/api/v1/settings", {
      fuelTable: { label: "Dup", rows: [{ upToCrankingKpa: 900, grade: "A" }, { upToCrankingKpa: 900, grade: "B" }] },
    });
    expect(dup.status).toBe(400);
  });

  it.each([DEMO.manager, DEMO.chief, DEMO.mechanic, DEMO.viewer])("refuses changes from %s", async (email) => {
    const c = await signedIn(email);
    expect((await c.patch("/api/v1/settings", { general: { name: "Taken over" } })).status).toBe(403);
    expect((await c.get("/api/v1/settings")).status).toBe(200);
  });
});

describe("job lease", () => {
  it("gives the lease to one holder until it expires, then to the next", async () => {
    const name = `test-${uniqueSuffix()}`;
    const t0 = new Date("2026-12-01T06:00:00Z");
    const [a, b] = await Promise.all([
      acquireLease(testDb(), name, "server-a", 60_000, t0),
      acquireLease(testDb(), name, "server-b", 60_000, t0),
    ]);
    expect([a.held, b.held].filter(Boolean)).toHaveLength(1);
    const winner = a.held ? "server-a" : "server-b";
    const loser = a.held ? "server-b" : "server-a";
    expect((await acquireLease(testDb(), name, winner, 60_000, new Date(t0.getTime() + 30_000))).held).toBe(true);
    expect((await acquireLease(testDb(), name, loser, 60_000, new Date(t0.getTime() + 60_000))).held).toBe(false);
    expect((await acquireLease(testDb(), name, loser, 60_000, new Date(t0.getTime() + 91_000))).held).toBe(true);
  });
});
