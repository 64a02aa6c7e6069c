import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFile, spawnSync } from "node:child_process";
import { join, resolve } from "node:path";
import { promisify } from "node:util";
import { BASE_URL, type ApiClient } from "../support/api.ts";
import { testDb } from "../support/db.ts";
import { createCrew, daysAgo, engineIn, type Crew } from "./motors-fixtures.ts";
import { socketPathFor, startMariaDb, type MariaDbOptions } from "../../scripts/lib/mariadb.ts";

// The test MariaDB is stopped in the middle of a load of writes and started again. Meanwhile the
// app must answer 503 in its error shape (pages: a 503 page), come back by itself within seconds,
// and leave no write half-done: every answered 2xx is in the database whole, every 503 left nothing.

const run = promisify(execFile);
const WORK = process.env.RINGLAND_TEST_WORK ?? "";
const OPTIONS: MariaDbOptions = {
  dataDir: join(WORK, "mariadb"),
  port: Number(process.env.DB_PORT),
  database: process.env.DB_NAME ?? "ringland_test",
  user: process.env.DB_USER ?? "ringland_test",
  password: process.env.DB_PASSWORD ?? "",
};
const SOCKET = socketPathFor(resolve(OPTIONS.dataDir));
const ADMIN = ["/usr/bin/mariadb-admin", "/usr/sbin/mariadb-admin"].find((p) => spawnSync("test", ["-x", p]).status === 0) ?? "mariadb-admin";
const RECOVERY_MS = 5000;

function isUp(): boolean {
  return spawnSync(ADMIN, ["--no-defaults", `--socket=${SOCKET}`, "-uroot", "ping"], { encoding: "utf8" }).status === 0;
}

async function stopDatabase(): Promise<void> {
  await run(ADMIN, ["--no-defaults", `--socket=${SOCKET}`, "-uroot", "shutdown"], { timeout: 60_000 });
}

async function startDatabase(): Promise<void> {
  await startMariaDb(OPTIONS, () => undefined);
}

interface Sent {
  kind: "usage" | "set";
  marker: string;
  engineId: number;
  startedAt: number;
  endedAt: number;
  status: number;
  body: string;
}

const sleep = (ms: number): Promise<void> => new Promise((r) => setTimeout(r, ms));

async function post(client: ApiClient, path: string, body: unknown): Promise<{ status: number; text: string }> {
  try {
    const res = await fetch(BASE_URL + path, {
      method: "POST",
      headers: { "content-type": "application/json", cookie: client.cookieHeader(), origin: new URL(BASE_URL).origin },
      body: JSON.stringify(body),
      signal: AbortSignal.timeout(20_000),
    });
    return { status: res.status, text: await res.text() };
  } catch (err) {
    return { status: 0, text: String(err) }; // no answer at all (a hang or a reset): never acceptable
  }
}

let crew: Crew;
let engines: { id: number; cylinders: number }[] = [];
const sent: Sent[] = [];

beforeAll(async () => {
  expect(WORK, "RINGLAND_TEST_WORK names the test run's folder").not.toBe("");
  expect(isUp(), `the test MariaDB answers on ${SOCKET}`).toBe(true);
  crew = await createCrew();
  for (const cylinders of [1, 2, 4]) engines.push({ id: await engineIn(crew.orgId, { cylinders }), cylinders });
});

afterAll(async () => {
  // Whatever happened above, the tests after this one get their database back.
  if (!isUp()) await startDatabase();
});

/** One client writing as fast as it is answered: usage and reading sets by turns. */
async function writeLoop(client: ApiClient, name: string, stop: () => boolean): Promise<void> {
  for (let n = 0; !stop(); n += 1) {
    const engine = engines[n % engines.length];
    const marker = `outage-${name}-${n}`;
    const startedAt = Date.now();
    const res =
      n % 2 === 0
        ? await post(client, "/api/v1/usage", { engineId: engine.id, occurredOn: daysAgo(1), amount: 0.25, notes: marker })
        : await post(client, "/api/v1/reading-sets", {
            engineId: engine.id,
            takenOn: daysAgo(1),
            setKind: "between_events",
            methodNotes: marker,
            cylinders: Array.from({ length: engine.cylinders }, (_, i) => ({ cylinderNo: i + 1, crankingKpa: 900 + i, leakdownPct: 4 + i })),
          });
    sent.push({ kind: n % 2 === 0 ? "usage" : "set", marker, engineId: engine.id, startedAt, endedAt: Date.now(), status: res.status, body: res.text });
    if (res.status === 503) await sleep(50); // as a client told "retry-after" would, a little
  }
}

describe("MariaDB stopped during a load of writes", () => {
  let stopAt = 0; // the shutdown was asked for
  let downAt = 0; // the server has stopped
  let restartAt = 0; // the database may accept connections any time after this
  let upAt = 0;
  let firstSuccessAfterUp = 0;
  const outageProbes: { api: number; apiBody: string; page: number; pageBody: string; ms: number }[] = [];

  it("answers 503 while the database is away and recovers by itself once it is back", async () => {
    let stopping = false;
    const clients: [ApiClient, string][] = [[crew.mechanic, "mechanic"], [crew.chief, "chief"], [crew.manager, "manager"], [crew.owner, "owner"]];
    const loops = clients.map(([c, name]) => writeLoop(c, name, () => stopping));
    try {
      await sleep(1500);
      stopAt = Date.now();
      await stopDatabase();
      downAt = Date.now();
      for (let i = 0; i < 4; i += 1) {
        const t0 = Date.now();
        const api = await fetch(`${BASE_URL}/api/v1/engines`, { headers: { cookie: crew.owner.cookieHeader() }, signal: AbortSignal.timeout(20_000) });
        const page = await fetch(`${BASE_URL}/motors`, { headers: { cookie: crew.owner.cookieHeader() }, redirect: "manual", signal: AbortSignal.timeout(20_000) });
        outageProbes.push({ api: api.status, apiBody: await api.text(), page: page.status, pageBody: await page.text(), ms: Date.now() - t0 });
        await sleep(500);
      }
      restartAt = Date.now();
      await startDatabase();
      upAt = Date.now();
      while (Date.now() - upAt < RECOVERY_MS + 3000) {
        await sleep(100);
        const ok = sent.find((s) => s.startedAt >= upAt && s.status >= 200 && s.status < 300);
        if (ok && !firstSuccessAfterUp) firstSuccessAfterUp = ok.endedAt;
        if (firstSuccessAfterUp && Date.now() - firstSuccessAfterUp > 1500) break;
      }
    } finally {
      stopping = true;
      await Promise.all(loops);
      if (!isUp()) await startDatabase();
    }

    expect(outageProbes.length).toBe(4);
    for (const p of outageProbes) {
      expect(p.api, p.apiBody).toBe(503);
      expect(JSON.parse(p.apiBody).error).toMatchObject({ code: "unavailable", message: expect.stringMatching(/database/i) });
      expect(p.page).toBe(503);
      expect(p.pageBody).toMatch(/cannot reach its database/i);
      expect(p.ms, "an answer during the outage comes at once, not after a pool timeout").toBeLessThan(3000);
    }
    const during = sent.filter((s) => s.startedAt > downAt && s.endedAt < restartAt);
    expect(during.length, "the load kept writing during the outage").toBeGreaterThan(0);
    for (const s of during) {
      expect(s.status, `${s.marker}: ${s.body.slice(0, 200)}`).toBe(503);
      expect(JSON.parse(s.body).error.code).toBe("unavailable");
    }
    const statuses = new Set(sent.map((s) => s.status));
    for (const s of statuses) expect([200, 201, 503], `a write answered ${s}: ${sent.find((x) => x.status === s)?.body.slice(0, 300)}`).toContain(s);
    expect(firstSuccessAfterUp, "a write succeeded after the database came back, with no restart of the app").toBeGreaterThan(0);
    expect(firstSuccessAfterUp - upAt).toBeLessThan(RECOVERY_MS);
    const late = sent.filter((s) => s.startedAt > firstSuccessAfterUp + 500);
    expect(late.length).toBeGreaterThan(0);
    expect(late.filter((s) => s.status !== 200 && s.status !== 201).map((s) => `${s.marker} ${s.status}`)).toEqual([]);
    const ok = sent.filter((s) => s.status === 200 || s.status === 201).length;
    const slowest = Math.max(...sent.filter((s) => s.startedAt > downAt && s.endedAt < restartAt).map((s) => s.endedAt - s.startedAt));
    console.info(
      `db outage: ${sent.length} writes from 4 clients, ${ok} stored (2xx), ${sent.length - ok} refused with 503; ` +
        `shutdown took ${downAt - stopAt} ms, down for ${restartAt - downAt} ms, restart took ${upAt - restartAt} ms; ` +
        `first stored write ${firstSuccessAfterUp - upAt} ms after the restart; slowest answer while down ${slowest} ms`,
    );
    const before = sent.filter((s) => s.endedAt < stopAt);
    expect(before.length, "writes went through before the shutdown").toBeGreaterThan(0);
    expect(before.filter((s) => s.status !== 201).map((s) => `${s.marker} ${s.status}`)).toEqual([]);
  });

  it("left no write half-done: every 2xx is stored whole, every 503 stored nothing", async () => {
    const k = testDb();
    const usageRows = await k("usage_entries").where({ organisation_id: crew.orgId }).select("notes");
    const usageCount = new Map<string, number>();
    for (const r of usageRows) usageCount.set(r.notes, (usageCount.get(r.notes) ?? 0) + 1);
    const sets = await k("reading_sets as rs")
      .leftJoin("cylinder_readings as cr", "cr.reading_set_id", "rs.id")
      .join("engines as e", "e.id", "rs.engine_id")
      .where("rs.organisation_id", crew.orgId)
      .groupBy("rs.id", "rs.method_notes", "e.cylinders")
      .select<{ id: number; marker: string; cylinders: number; rows: number | string }[]>("rs.id", "rs.method_notes as marker", "e.cylinders", k.raw("count(cr.id) as `rows`"));
    const setCount = new Map<string, number>();
    for (const s of sets) {
      expect(Number(s.rows), `reading set ${s.marker} has a row for each of its ${s.cylinders} cylinders`).toBe(Number(s.cylinders));
      setCount.set(s.marker, (setCount.get(s.marker) ?? 0) + 1);
    }
    const stored = (s: Sent): number => (s.kind === "usage" ? usageCount : setCount).get(s.marker) ?? 0;
    // A connection lost on the COMMIT itself leaves the outcome unknown to anyone; the app says so
    // ("may or may not have been saved") instead of "Nothing was saved", and either outcome is whole.
    const unknown = (s: Sent): boolean => s.status === 503 && /may or may not have been saved/.test(s.body);
    const wrong = sent
      .filter((s) => ((s.status === 200 || s.status === 201) ? stored(s) !== 1 : unknown(s) ? stored(s) > 1 : stored(s) !== 0))
      .map((s) => `${s.kind} ${s.marker}: answered ${s.status} ${s.body.slice(0, 120)}, stored ${stored(s)} times`);
    expect(wrong).toEqual([]);
    const unknownStored = sent.filter((s) => unknown(s) && stored(s) === 1).length;
    console.info(`db outage: ${sent.filter(unknown).length} answers said the outcome was unknown; ${unknownStored} of those had been stored`);
    expect(usageRows.length + sets.length).toBe(sent.filter((s) => s.status === 200 || s.status === 201).length + unknownStored);
    const audit = await k("audit_log").where({ organisation_id: crew.orgId }).whereIn("action", ["usage.logged", "reading_set.created"]).count({ n: "*" }).first();
    expect(Number(audit?.n), "one audit row per stored write, written in the same transaction").toBe(usageRows.length + sets.length);
  });

  it("leaves the database running for the tests after this one", async () => {
    expect(isUp()).toBe(true);
    const res = await crew.viewer.get("/api/v1/engines");
    expect(res.status).toBe(200);
  });
});
