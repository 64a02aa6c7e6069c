import { beforeEach, describe, expect, it } from "vitest";
import { spawn } from "node:child_process";
import { ApiClient, MAIL_INBOX_URL, signedIn } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { listMessages, waitForMessages } from "../support/mail-catcher-client.ts";
import { addMember, createOrganisation, createUser, uniqueSuffix } from "../factories/people.ts";
import { createEngine, createReadingSet, logUsage } from "../factories/motors.ts";
import { runSignalCheck } from "../../src/server/signals/check.ts";
import { loadEngineSignalInputs } from "../../src/server/signals/engine-inputs.ts";
import { deliverOutbox } from "../../src/server/mail/outbox.ts";
import { createMailTransport } from "../../src/server/mail/transport.ts";
import { freePort } from "../../scripts/lib/processes.ts";
import { convertCrankingToElevation } from "../../src/lib/domain/cranking.ts";

const PASSWORD = "a-long-test-password";
const NOW = new Date("2026-12-01T13:00:00Z");

beforeEach(async () => {
  await clearSignInAttempts();
});

/** A crew with one person per role and an engine whose chamber on cylinder 1 carbons up (invented numbers). */
async function crewWithDrift() {
  const s = uniqueSuffix();
  const orgId = await createOrganisation(testDb(), { name: `Signals ${s}`, slug: `signals-${s}`, shopElevationM: 366 });
  const people: Record<string, { id: string; email: string }> = {};
  for (const role of ["owner", "manager", "crew_chief", "mechanic", "viewer"] as const) {
    const email = `${role}-${s}@test.example`;
    const id = await createUser(testDb(), { email, name: `${role} ${s}`, password: PASSWORD });
    await addMember(testDb(), orgId, id, role);
    people[role] = { id, email };
  }
  const engineId = await createEngine(testDb(), orgId, { name: `Twin-${s}`, status: "running", topEndLimit: 8, bottomEndLimit: 24 });
  await createReadingSet(testDb(), orgId, {
    engineId, takenOn: "2026-11-20", elevationM: 366, isBaseline: true, setKind: "build",
    cylinders: [
      { cylinderNo: 1, chamberReadingsCc: [23.6, 23.6], squishAMm: 1.2, squishBMm: 1.21 },
      { cylinderNo: 2, chamberReadingsCc: [23.6, 23.6], squishAMm: 1.21, squishBMm: 1.2 },
    ],
  });
  await logUsage(testDb(), orgId, { engineId, occurredOn: "2026-11-25", amount: 2.0 });
  return { orgId, engineId, people };
}

async function addCarbonReading(orgId: number, engineId: number, cyl1: number, takenOn: string) {
  await createReadingSet(testDb(), orgId, {
    engineId, takenOn, elevationM: 366,
    cylinders: [
      { cylinderNo: 1, chamberReadingsCc: [cyl1, cyl1], squishAMm: 1.2, squishBMm: 1.21 },
      { cylinderNo: 2, chamberReadingsCc: [23.6, 23.6], squishAMm: 1.21, squishBMm: 1.2 },
    ],
  });
}

const check = (orgId: number, now = NOW) => runSignalCheck(testDb(), orgId, now, loadEngineSignalInputs, {});

describe("the signal check and its mail", () => {
  it("opens a drift signal once and mails each subscribed crew chief exactly once, however often it runs", async () => {
    const { orgId, engineId, people } = await crewWithDrift();
    await addCarbonReading(orgId, engineId, 22.9, "2026-11-30"); // −3.0 % on cylinder 1: act
    const first = await check(orgId);
    expect(first.opened).toBeGreaterThanOrEqual(1);
    const rows = await testDb()("signals").where({ organisation_id: orgId });
    const chamber = rows.find((r) => r.kind === "drift" && r.metric === "chamber" && r.cylinder === 1);
    expect(chamber?.severity).toBe("act");

    const second = await check(orgId);
    expect(second.opened).toBe(0);
    expect(await testDb()("signals").where({ organisation_id: orgId })).toHaveLength(rows.length);

    const outbox = await testDb()("mail_outbox").where({ organisation_id: orgId });
    expect(outbox.length).toBeGreaterThan(0);
    expect(new Set(outbox.map((o) => o.to_address))).toEqual(new Set([people.crew_chief.email]));

    await Promise.all([deliverOutbox(), deliverOutbox()]);
    await deliverOutbox();
    const mails = await waitForMessages(MAIL_INBOX_URL, (m) => m.to.includes(people.crew_chief.email), 10_000, { count: outbox.length });
    expect(mails).toHaveLength(outbox.length);
    expect(mails).toHaveLength(1); // one engine: the crew chief gets one mail listing its signals
    const mail = mails[0];
    expect(mail.subject).toMatch(/^\[Act\]/);
    expect(mail.text).toMatch(/chamber/);
    expect(mail.html).toContain(`/motors/${engineId}`);
    expect(mail.html).toContain("<table");
    expect(mail.headers["list-unsubscribe"]).toMatch(/\/unsubscribe\//);
    for (const role of ["owner", "manager", "mechanic", "viewer"]) {
      expect(await listMessages(MAIL_INBOX_URL, { to: people[role].email })).toHaveLength(0);
    }
  });

  it("keeps one signal when two runners check at the same moment", async () => {
    const { orgId, engineId } = await crewWithDrift();
    await addCarbonReading(orgId, engineId, 22.9, "2026-11-30");
    const reports = await Promise.allSettled([check(orgId), check(orgId), check(orgId)]);
    expect(reports.some((r) => r.status === "fulfilled")).toBe(true);
    const rows = await testDb()("signals").where({ organisation_id: orgId });
    const keys = rows.map((r) => r.signal_key);
    expect(new Set(keys).size).toBe(keys.length);
    const outbox = await testDb()("mail_outbox").where({ organisation_id: orgId });
    expect(new Set(outbox.map((o) => o.dedupe_key)).size).toBe(outbox.length);
    expect(outbox.length).toBe(1); // one crew chief, one mail for the engine's new signals
  });

  it("sends a mail exactly once after a runner died between writing the outbox and sending", async () => {
    const { orgId, engineId, people } = await crewWithDrift();
    await addCarbonReading(orgId, engineId, 22.9, "2026-11-30");
    await check(orgId); // the outbox is written; the "crashed" runner never delivers
    const pending = await testDb()("mail_outbox").where({ organisation_id: orgId });
    // One row was claimed by a runner that then died: its claim expired a minute ago.
    await testDb()("mail_outbox").where({ id: pending[0].id }).update({ status: "sending", claimed_by: "dead-runner", claimed_until: new Date(Date.now() - 60_000) });
    await Promise.all([deliverOutbox(), deliverOutbox()]);
    await deliverOutbox();
    const mails = await waitForMessages(MAIL_INBOX_URL, (m) => m.to.includes(people.crew_chief.email), 10_000, { count: pending.length });
    await new Promise((r) => setTimeout(r, 300));
    expect(await listMessages(MAIL_INBOX_URL, { to: people.crew_chief.email })).toHaveLength(pending.length);
    expect(new Set(mails.map((m) => m.headers["x-ringland-key"])).size).toBe(pending.length);
  });

  it("keeps mail waiting while the mail server is down and sends it when it is back", async () => {
    const { orgId, engineId, people } = await crewWithDrift();
    await addCarbonReading(orgId, engineId, 22.9, "2026-11-30");
    await check(orgId);
    const down = createMailTransport({ host: "127.0.0.1", port: await freePort() });
    const failed = await deliverOutbox({ transport: down });
    expect(failed.deferred).toBeGreaterThan(0);
    const waiting = await testDb()("mail_outbox").where({ organisation_id: orgId });
    expect(waiting.every((o) => o.status === "pending" && o.attempts === 1 && o.last_error)).toBe(true);
    expect(await listMessages(MAIL_INBOX_URL, { to: people.crew_chief.email })).toHaveLength(0);
    // Before the backoff has passed nothing is retried; after it, the mail goes out.
    expect((await deliverOutbox()).sent).toBe(0);
    const later = await deliverOutbox({ now: () => new Date(Date.now() + 10 * 60_000) });
    expect(later.sent).toBe(waiting.length);
    await waitForMessages(MAIL_INBOX_URL, (m) => m.to.includes(people.crew_chief.email), 10_000, { count: waiting.length });
  });

  it("raises nothing new while a condition persists, resolves it when it clears, and opens a new one when it returns", async () => {
    const { orgId, engineId } = await crewWithDrift();
    await addCarbonReading(orgId, engineId, 22.9, "2026-11-28");
    await check(orgId);
    const firstRows = await testDb()("signals").where({ organisation_id: orgId, kind: "drift", metric: "chamber" });
    expect(firstRows).toHaveLength(1);
    await addCarbonReading(orgId, engineId, 23.6, "2026-11-29"); // cleaned: back on the baseline
    const cleared = await check(orgId, new Date("2026-11-29T12:00:00Z"));
    expect(cleared.autoResolved).toBeGreaterThanOrEqual(1);
    expect((await testDb()("signals").where({ id: firstRows[0].id }).first()).state).toBe("resolved");
    await addCarbonReading(orgId, engineId, 22.9, "2026-11-30");
    await check(orgId);
    const all = await testDb()("signals").where({ organisation_id: orgId, kind: "drift", metric: "chamber" }).orderBy("id");
    expect(all).toHaveLength(2);
    expect(all[1].state).toBe("open");
  });

  it("raises no signal for a healthy engine read at a high event", async () => {
    const { orgId, engineId } = await crewWithDrift();
    // Cranking 150 psi (1034.2 kPa) at the shop (366 m), and what the same healthy engine reads at
    // 2,621 m, where the standard atmosphere's lower pressure alone lowers the gauge reading.
    await testDb()("cylinder_readings").whereIn("reading_set_id", testDb()("reading_sets").where({ engine_id: engineId }).select("id")).update({ cranking_kpa: 1034.2 });
    const atAltitude = Math.round(convertCrankingToElevation(1034.2, 366, 2621) * 10) / 10;
    expect(atAltitude).toBeLessThan(1034.2 * 0.8); // raw, it looks like a 20 %+ loss
    await createReadingSet(testDb(), orgId, {
      engineId, takenOn: "2026-11-30", elevationM: 2621,
      cylinders: [
        { cylinderNo: 1, chamberReadingsCc: [23.6, 23.6], squishAMm: 1.2, squishBMm: 1.21, crankingKpa: atAltitude },
        { cylinderNo: 2, chamberReadingsCc: [23.6, 23.6], squishAMm: 1.21, squishBMm: 1.2, crankingKpa: atAltitude },
      ],
    });
    const report = await check(orgId);
    expect(report.opened).toBe(0);
  });

  it("stops a person's mail from the unsubscribe link without signing in", async () => {
    const { orgId, engineId, people } = await crewWithDrift();
    await addCarbonReading(orgId, engineId, 22.9, "2026-11-30");
    await check(orgId);
    const [row] = await testDb()("mail_outbox").where({ organisation_id: orgId, to_address: people.crew_chief.email });
    const link = /\/unsubscribe\/[A-Za-z0-9_-]+\?topic=drift/.exec(row.body_text)![0];
    const anon = new ApiClient();
    const page = await anon.get(link);
    expect(page.status).toBe(200);
    const post = await anon.request("POST", link, "", { "content-type": "application/x-www-form-urlencoded" });
    expect(post.status).toBe(200);
    const pref = await testDb()("notification_preferences").where({ user_id: people.crew_chief.id, organisation_id: orgId, topic: "drift" }).first();
    expect(pref.mode).toBe("off");
  });
});

describe("the Signals API", () => {
  it("lets a crew chief acknowledge and resolve, refuses a mechanic, hides signals from viewers and other organisations", async () => {
    const { orgId, engineId, people } = await crewWithDrift();
    await addCarbonReading(orgId, engineId, 22.9, "2026-11-30");
    await check(orgId);
    const chief = await signedIn(people.crew_chief.email, PASSWORD);
    const list = await chief.get("/api/v1/signals?severity=act");
    expect(list.status).toBe(200);
    const id = list.body.signals[0].id;
    const mechanic = await signedIn(people.mechanic.email, PASSWORD);
    expect((await mechanic.get("/api/v1/signals")).status).toBe(200);
    expect((await mechanic.post(`/api/v1/signals/${id}`, { action: "acknowledge" })).status).toBe(403);
    expect((await (await signedIn(people.viewer.email, PASSWORD)).get("/api/v1/signals")).status).toBe(403);
    const other = await signedIn("chief@ringland.example");
    expect((await other.post(`/api/v1/signals/${id}`, { action: "acknowledge" })).status).toBe(404);

    expect((await chief.post(`/api/v1/signals/${id}`, { action: "acknowledge" })).status).toBe(200);
    const noNote = await chief.post(`/api/v1/signals/${id}`, { action: "resolve", note: "" });
    expect(noNote.status).toBe(400);
    expect(noNote.body.error.fields.note).toBeTruthy();
    expect((await chief.post(`/api/v1/signals/${id}`, { action: "resolve", note: "Decarbonised the crown." })).status).toBe(200);
    const row = await testDb()("signals").where({ id }).first();
    expect(row.state).toBe("resolved");
    expect(row.acknowledged_by).toBe(people.crew_chief.id);
    expect(row.resolution_note).toBe("Decarbonised the crown.");
  });
});

describe("two job runners", () => {
  it("share one lease: only one of them works", async () => {
    await testDb()("job_leases").delete();
    const start = (name: string) =>
      spawn(process.execPath, ["--import", "tsx", "jobs/runner.ts"], { env: { ...process.env, NODE_ENV: "production", JOB_HOLDER: name }, stdio: ["ignore", "pipe", "pipe"] });
    const a = start("runner-a");
    const b = start("runner-b");
    let out = "";
    for (const p of [a, b]) p.stdout!.on("data", (d: Buffer) => (out += d.toString()));
    try {
      const deadline = Date.now() + 20_000;
      let lease;
      while (Date.now() < deadline) {
        lease = await testDb()("job_leases").where({ name: "scheduled-jobs" }).first();
        if (lease && out.includes("runner-a") && out.includes("runner-b")) break;
        await new Promise((r) => setTimeout(r, 250));
      }
      expect(["runner-a", "runner-b"]).toContain(lease?.holder);
      await new Promise((r) => setTimeout(r, 1500));
      expect((await testDb()("job_leases").where({ name: "scheduled-jobs" }).first()).holder).toBe(lease!.holder);
      const loser = lease!.holder === "runner-a" ? "runner-b" : "runner-a";
      expect(out).not.toMatch(new RegExp(`${loser}.*signals: organisation`));
    } finally {
      a.kill("SIGTERM");
      b.kill("SIGTERM");
      await Promise.all([a, b].map((p) => new Promise((r) => p.once("exit", r))));
    }
  });
});
