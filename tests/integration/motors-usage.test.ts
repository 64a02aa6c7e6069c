import Papa from "papaparse";
import { beforeAll, describe, expect, it } from "vitest";
import { ApiClient } from "../support/api.ts";
import { testDb } from "../support/db.ts";
import { createReadingSet, installEngine, recordService } from "../factories/motors.ts";
import { loadEngineCounters, sumEngineCountersLive } from "../../src/db/counters-repo.ts";
import { chassisIn, createCrew, daysAgo, engineIn, type Crew } from "./motors-fixtures.ts";

let crew: Crew;
let other: Crew;

beforeAll(async () => {
  crew = await createCrew();
  other = await createCrew();
});

describe("logging usage", () => {
  it("logs a session from the pits, lists it with totals, and archives instead of deleting", async () => {
    const engine = await engineIn(crew.orgId);
    const res = await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(2), amount: 0.75, sessionLabel: "Heat 1", eventLabel: "Harlow Lake" });
    expect(res.status).toBe(201);
    expect(res.body.entry).toMatchObject({ engineId: engine, amount: 0.75, unit: "hours", source: "manual", sessionLabel: "Heat 1", eventLabel: "Harlow Lake" });
    await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(1), amount: 0.5 });
    const list = await crew.viewer.get(`/api/v1/usage?engineId=${engine}`);
    expect(list.body).toMatchObject({ total: 2, totalAmount: 1.25 });
    expect(list.body.entries[0].occurredOn).toBe(daysAgo(1));
    const id = res.body.entry.id;
    expect((await crew.mechanic.delete(`/api/v1/usage/${id}`)).body.entry.archivedAt).not.toBeNull();
    expect(await testDb()("usage_entries").where({ id }).first()).toBeTruthy();
    expect((await crew.viewer.get(`/api/v1/engines/${engine}/counters`)).body.counters.sinceNew).toBe(0.5);
    expect((await crew.mechanic.patch(`/api/v1/usage/${id}`, { archived: false })).body.entry.archivedAt).toBeNull();
    expect((await crew.viewer.get(`/api/v1/engines/${engine}/counters`)).body.counters.sinceNew).toBe(1.25);
  });

  it("names bad fields and refuses the future, both amount and meter, and retired engines", async () => {
    const engine = await engineIn(crew.orgId);
    const bad = await crew.mechanic.post("/api/v1/usage", { engineId: "x", occurredOn: "yesterday", amount: -1 });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["amount", "engineId", "occurredOn"]);
    expect((await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: "2999-01-01", amount: 1 })).body.error.fields.occurredOn).toBeTruthy();
    expect((await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(1), amount: 1, meterReading: 4 })).status).toBe(400);
    const retired = await engineIn(crew.orgId, { status: "retired" });
    expect((await crew.mechanic.post("/api/v1/usage", { engineId: retired, occurredOn: daysAgo(1), amount: 1 })).status).toBe(409);
  });

  it("turns meter readings into usage, refusing a reading lower than the last", async () => {
    const engine = await engineIn(crew.orgId);
    const chassis = await chassisIn(crew.orgId, "hours");
    await installEngine(testDb(), crew.orgId, { engineId: engine, chassisId: chassis, installedAt: `${daysAgo(10)}T08:00:00Z`, meterAtInstall: 500 });
    const r1 = await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(5), meterReading: 501.4, sessionLabel: "Practice" });
    expect(r1.status).toBe(201);
    expect(r1.body.entry).toMatchObject({ amount: 1.4, source: "meter", meterReading: 501.4 });
    const r2 = await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(4), meterReading: 502 });
    expect(r2.body.entry.amount).toBe(0.6);
    const low = await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(3), meterReading: 501 });
    expect(low.status).toBe(400);
    expect(low.body.error.fields.meterReading).toMatch(/502/);
    const duration = await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(3), amount: 1 });
    expect(duration.status).toBe(409);
    expect((await crew.viewer.get(`/api/v1/engines/${engine}/counters`)).body.counters.sinceNew).toBe(2);
  });
});

function csv(rows: (string | number)[][]): string {
  return Papa.unparse(rows);
}

describe("CSV import", () => {
  it("previews good rows and every bad row with its reason, writes in one go, and never doubles on re-import", async () => {
    const a = await engineIn(crew.orgId, { name: `Imp-A-${Date.now()}`, serial: `IMPSER-${Date.now()}` });
    const aName = (await testDb()("engines").where({ id: a }).first()).name;
    const aSerial = (await testDb()("engines").where({ id: a }).first()).serial;
    const retired = await engineIn(crew.orgId, { status: "retired" });
    const retiredName = (await testDb()("engines").where({ id: retired }).first()).name;
    const file = csv([
      ["Motor", "Day", "Hours", "Session", "Event"],
      [aName, daysAgo(9), "1.5", "Practice", "Pinecrest"],
      [aName, daysAgo(9), "1.5", "Practice", "Pinecrest"], // a second identical session: both count
      [aSerial, daysAgo(8), "0,75", "Final", "Pinecrest"],
      ["Nobody", daysAgo(8), "1", "", ""],
      [aName, "31/02/2026", "1", "", ""],
      [aName, daysAgo(7), "lots", "", ""],
      [retiredName, daysAgo(7), "1", "", ""],
      [aName, "2999-01-01", "1", "", ""],
    ]);
    const preview = await crew.mechanic.post("/api/v1/usage/import/preview", { csv: file });
    expect(preview.status).toBe(200);
    expect(preview.body.mapping).toMatchObject({ engine: "Motor", date: "Day", amount: "Hours", session: "Session", event: "Event" });
    expect(preview.body.summary).toEqual({ rowsRead: 8, toWrite: 3, duplicates: 0, bad: 5, amountToWrite: 3.75 });
    expect(preview.body.errors.map((e: { line: number; field: string }) => [e.line, e.field])).toEqual([
      [5, "engine"],
      [6, "date"],
      [7, "amount"],
      [8, "engine"],
      [9, "date"],
    ]);
    expect(preview.body.errors[0].reason).toMatch(/No engine/);
    expect(await testDb()("usage_entries").where({ engine_id: a }).first()).toBeUndefined();

    const refused = await crew.mechanic.post("/api/v1/usage/import/commit", { csv: file });
    expect(refused.status).toBe(400);
    expect(await testDb()("usage_entries").where({ engine_id: a }).first()).toBeUndefined();

    const commit = await crew.mechanic.post("/api/v1/usage/import/commit", { csv: file, skipBadRows: true });
    expect(commit.status).toBe(200);
    expect(commit.body).toMatchObject({ written: 3, skippedBad: 5, amountWritten: 3.75 });
    expect((await crew.viewer.get(`/api/v1/engines/${a}/counters`)).body.counters.sinceNew).toBe(3.75);

    const again = await crew.mechanic.post("/api/v1/usage/import/preview", { csv: file });
    expect(again.body.summary).toMatchObject({ toWrite: 0, duplicates: 3 });
    const recommit = await crew.mechanic.post("/api/v1/usage/import/commit", { csv: file, skipBadRows: true });
    expect(recommit.body).toMatchObject({ written: 0, duplicates: 3 });
    // The same rows in another order, with other spacing and case, are the same rows.
    const shuffled = csv([
      ["Motor", "Day", "Hours", "Session", "Event"],
      [aSerial, daysAgo(8), "0.75", "final", " pinecrest "],
      [aName, daysAgo(9), "1.50", "PRACTICE", "Pinecrest"],
    ]);
    expect((await crew.mechanic.post("/api/v1/usage/import/commit", { csv: shuffled })).body.written).toBe(0);
    expect((await crew.viewer.get(`/api/v1/engines/${a}/counters`)).body.counters.sinceNew).toBe(3.75);
    expect(await testDb()("audit_log").where({ organisation_id: crew.orgId, action: "usage.imported" }).first()).toBeTruthy();
  });

  it("uses a column mapping and a date format, and says when the mapping does not fit", async () => {
    const engine = await engineIn(crew.orgId);
    const name = (await testDb()("engines").where({ id: engine }).first()).name;
    const [y, m, d] = daysAgo(3).split("-");
    const file = csv([["Sled engine", "When", "Time run"], [name, `${Number(m)}/${Number(d)}/${y}`, "2"]]);
    const unmapped = await crew.mechanic.post("/api/v1/usage/import/preview", { csv: file });
    expect(unmapped.body.mapping).toBeNull();
    expect(unmapped.body.columns).toEqual(["Sled engine", "When", "Time run"]);
    const wrong = await crew.mechanic.post("/api/v1/usage/import/preview", { csv: file, mapping: { engine: "Engine", date: "When", amount: "Time run" } });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields["mapping.engine"]).toBeTruthy();
    const body = { csv: file, mapping: { engine: "Sled engine", date: "When", amount: "Time run" }, dateFormat: "mdy" };
    const ok = await crew.mechanic.post("/api/v1/usage/import/commit", body);
    expect(ok.body.written).toBe(1);
    const row = await testDb()("usage_entries").where({ engine_id: engine }).first();
    expect(row).toMatchObject({ occurred_on: daysAgo(3), amount: 2, source: "import" });
  });

  it("writes each row once when the same file is committed twice at the same moment", async () => {
    const engine = await engineIn(crew.orgId);
    const name = (await testDb()("engines").where({ id: engine }).first()).name;
    const rows = [["Engine", "Date", "Hours"], ...Array.from({ length: 40 }, (_, i) => [name, daysAgo(10 + (i % 5)), String(0.1 * (i + 1))])];
    const body = { csv: csv(rows) };
    const [r1, r2] = await Promise.all([crew.mechanic.post("/api/v1/usage/import/commit", body), crew.owner.post("/api/v1/usage/import/commit", body)]);
    expect([r1.status, r2.status]).toEqual([200, 200]);
    expect(r1.body.written + r2.body.written).toBe(40);
    const count = await testDb()("usage_entries").where({ engine_id: engine }).count({ n: "*" }).first();
    expect(Number(count?.n)).toBe(40);
  });
});

describe("CSV export", () => {
  it("exports usage and readings per engine and per organisation, escaping formula cells", async () => {
    const engine = await engineIn(crew.orgId, { name: `Exp-${Date.now()}` });
    await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(2), amount: 1.1, sessionLabel: "=HYPERLINK(\"x\")" });
    await createReadingSet(testDb(), crew.orgId, {
      engineId: engine,
      takenOn: daysAgo(1),
      elevationM: 366,
      setKind: "between_events",
      cylinders: [{ cylinderNo: 1, chamberReadingsCc: [23.6, 23.6], squishAMm: 1.2, squishBMm: 1.21 }],
    });
    const usage = await crew.mechanic.get(`/api/v1/exports/usage?engineId=${engine}`);
    expect(usage.status).toBe(200);
    expect(usage.headers.get("content-type")).toMatch(/text\/csv/);
    expect(usage.headers.get("content-disposition")).toMatch(/attachment; filename="ringland-usage-engine-exp-/);
    const parsed = Papa.parse<Record<string, string>>(usage.body.replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: true });
    expect(parsed.data).toHaveLength(1);
    expect(parsed.data[0]).toMatchObject({ date: daysAgo(2), amount_hours: "1.1", source: "manual", session: "'=HYPERLINK(\"x\")" });

    const readings = await crew.mechanic.get(`/api/v1/exports/readings?engineId=${engine}`);
    const r = Papa.parse<Record<string, string>>(readings.body.replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: true }).data;
    expect(r).toHaveLength(1);
    expect(r[0]).toMatchObject({ cylinder: "1", chamber_readings_cc: "23.6; 23.6", chamber_status: "confirmed", chamber_cc: "23.6", squish_mean_mm: "1.205" });
    // (300.477 + 23.6) / 23.6 = 13.73
    expect(r[0].geometric_ratio).toBe("13.73");

    const org = await crew.owner.get("/api/v1/exports/usage");
    expect(org.status).toBe(200);
    expect(org.body).toContain(`Exp-`);
    expect((await crew.viewer.get("/api/v1/exports/usage")).status).toBe(403);
    expect((await other.owner.get(`/api/v1/exports/usage?engineId=${engine}`)).status).toBe(404);
    expect((await other.owner.get("/api/v1/exports/readings")).body).not.toContain("Exp-");
  });
});

describe("who may do what on usage", () => {
  it("answers 401, 403 and 404 as it should, changing nothing", async () => {
    const engine = await engineIn(crew.orgId);
    const entry = (await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(1), amount: 1 })).body.entry;
    const anon = new ApiClient();
    expect((await anon.get("/api/v1/usage")).status).toBe(401);
    expect((await anon.post("/api/v1/usage/import/preview", { csv: "a" })).status).toBe(401);
    expect((await crew.viewer.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(1), amount: 1 })).status).toBe(403);
    expect((await crew.viewer.post("/api/v1/usage/import/preview", { csv: "Engine,Date,Hours\n" })).status).toBe(403);
    expect((await crew.viewer.post("/api/v1/usage/import/commit", { csv: "Engine,Date,Hours\n" })).status).toBe(403);
    expect((await crew.viewer.delete(`/api/v1/usage/${entry.id}`)).status).toBe(403);
    expect((await other.owner.get(`/api/v1/usage/${entry.id}`)).status).toBe(404);
    expect((await other.owner.delete(`/api/v1/usage/${entry.id}`)).status).toBe(404);
    const foreign = await other.owner.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(1), amount: 5 });
    expect(foreign.status).toBe(400);
    expect(foreign.body.error.fields.engineId).toBeTruthy();
    expect((await other.owner.get(`/api/v1/usage?engineId=${engine}`)).body.total).toBe(0);
    const count = await testDb()("usage_entries").where({ engine_id: engine }).whereNull("archived_at").count({ n: "*" }).first();
    expect(Number(count?.n)).toBe(1);
  });
});

describe("the counter cache", () => {
  it("matches the sums over usage after logging, meters, imports, archiving and services (and in the demo data)", async () => {
    const engine = await engineIn(crew.orgId);
    const logged = (await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(9), amount: 2 })).body.entry;
    await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(4), amount: 1 });
    await recordService(testDb(), crew.orgId, { engineId: engine, kind: "top_end", doneOn: daysAgo(6) });
    await crew.mechanic.delete(`/api/v1/usage/${logged.id}`);
    const service = (await crew.mechanic.post(`/api/v1/engines/${engine}/services`, { kind: "bottom_end", doneOn: daysAgo(3) })).body.service;
    await crew.mechanic.post("/api/v1/usage", { engineId: engine, occurredOn: daysAgo(2), amount: 0.5 });
    await crew.mechanic.delete(`/api/v1/engines/${engine}/services/${service.id}`);
    const counters = (await crew.viewer.get(`/api/v1/engines/${engine}/counters`)).body.counters;
    expect(counters).toMatchObject({ sinceNew: 1.5, topEnd: { used: 1.5 }, bottomEnd: { used: 1.5 } });

    const orgs: number[] = (await testDb()("organisations").pluck("id")).map(Number);
    let compared = 0;
    for (const orgId of orgs) {
      const ids: number[] = (await testDb()("engines").where({ organisation_id: orgId }).pluck("id")).map(Number);
      const cached = await loadEngineCounters(orgId, ids, testDb());
      const live = await sumEngineCountersLive(orgId, ids, testDb());
      for (const id of ids) {
        const zero = { engineId: id, sinceNew: 0, sinceTopEnd: 0, sinceBottomEnd: 0, sinceInspection: 0, lastTopEndOn: null, lastBottomEndOn: null, lastInspectionOn: null };
        expect(cached.get(id) ?? zero).toEqual(live.get(id));
        compared += 1;
      }
    }
    expect(compared).toBeGreaterThan(20);
  });
});
