import { beforeEach, describe, expect, it } from "vitest";
import { ApiClient, DEMO, MAIL_INBOX_URL, signedIn } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { waitForMessages } from "../support/mail-catcher-client.ts";
import { addMember, createOrganisation, createUser, uniqueSuffix } from "../factories/people.ts";

const PASSWORD = "a-long-test-password";

/** A fresh organisation with one owner, so tests can change its crew freely. */
async function freshCrew(): Promise<{ orgId: number; owner: ApiClient; ownerId: string }> {
  const s = uniqueSuffix();
  const orgId = await createOrganisation(testDb(), { name: `Test Crew ${s}`, slug: `test-${s}` });
  const email = `owner-${s}@test.example`;
  const ownerId = await createUser(testDb(), { email, name: "Owner Person", password: PASSWORD });
  await addMember(testDb(), orgId, ownerId, "owner");
  const owner = await signedIn(email, PASSWORD);
  return { orgId, owner, ownerId };
}

async function member(orgId: number, role: "owner" | "manager" | "crew_chief" | "mechanic" | "viewer") {
  const email = `${role}-${uniqueSuffix()}@test.example`;
  const id = await createUser(testDb(), { email, name: `A ${role}`, password: PASSWORD });
  await addMember(testDb(), orgId, id, role);
  return { id, email, client: await signedIn(email, PASSWORD) };
}

beforeEach(async () => {
  await clearSignInAttempts();
});

describe("invitations", () => {
  it("mails an invitation that, accepted, creates the account with its role and signs the person in", async () => {
    const { orgId, owner } = await freshCrew();
    const email = `newcomer-${uniqueSuffix()}@test.example`;
    const res = await owner.post("/api/v1/crew/invitations", { email, role: "crew_chief" });
    expect(res.status).toBe(201);
    const [mail] = await waitForMessages(MAIL_INBOX_URL, (m) => m.to.includes(email), 10_000);
    expect(mail.subject).toMatch(/invites you/);
    const token = /\/invite\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];

    const newcomer = new ApiClient();
    const bad = await newcomer.post("/api/auth/accept-invitation", { token, name: "", password: "x" });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["name", "password"]);
    expect(await testDb()("users").where({ email }).first()).toBeUndefined();

    const ok = await newcomer.post("/api/auth/accept-invitation", { token, name: "New Comer", password: PASSWORD });
    expect(ok.status).toBe(200);
    const crew = await newcomer.get("/api/v1/crew/members");
    expect(crew.status).toBe(200);
    expect(crew.body.members.find((m: { email: string }) => m.email === email).role).toBe("crew_chief");
    const audit = await testDb()("audit_log").where({ organisation_id: orgId }).pluck("action");
    expect(audit).toEqual(expect.arrayContaining(["member.invited", "member.joined"]));

    const again = await new ApiClient().post("/api/auth/accept-invitation", { token, name: "Someone", password: PASSWORD });
    expect(again.status).toBe(400);
  });

  it("refuses an expired invitation and changes nothing", async () => {
    const { owner } = await freshCrew();
    const email = `late-${uniqueSuffix()}@test.example`;
    await owner.post("/api/v1/crew/invitations", { email, role: "mechanic" });
    const [mail] = await waitForMessages(MAIL_INBOX_URL, (m) => m.to.includes(email), 10_000);
    const token = /\/invite\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];
    await testDb()("invitations").where({ email }).update({ expires_at: new Date(Date.now() - 1000) });
    const res = await new ApiClient().post("/api/auth/accept-invitation", { token, name: "Late", password: PASSWORD });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/expired/);
    expect(await testDb()("users").where({ email }).first()).toBeUndefined();
  });

  it("refuses to invite someone who is already a member", async () => {
    const { orgId, owner } = await freshCrew();
    const m = await member(orgId, "mechanic");
    const res = await owner.post("/api/v1/crew/invitations", { email: m.email, role: "viewer" });
    expect(res.status).toBe(409);
    expect(res.body.error.fields.email).toBeTruthy();
  });

  it("names bad fields", async () => {
    const { owner } = await freshCrew();
    const res = await owner.post("/api/v1/crew/invitations", { email: "nope", role: "admiral" });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(["email", "role"]);
  });

  it.each(["manager", "crew_chief", "mechanic", "viewer"] as const)("refuses an invitation from a %s", async (role) => {
    const { orgId } = await freshCrew();
    const m = await member(orgId, role);
    const res = await m.client.post("/api/v1/crew/invitations", { email: `x-${uniqueSuffix()}@test.example`, role: "viewer" });
    expect(res.status).toBe(403);
  });

  it("answers 401 without a session", async () => {
    const res = await new ApiClient().post("/api/v1/crew/invitations", { email: "a@test.example", role: "viewer" });
    expect(res.status).toBe(401);
  });
});

describe("roles and the last owner", () => {
  it("changes a role and writes it to the audit log", async () => {
    const { orgId, owner } = await freshCrew();
    const m = await member(orgId, "mechanic");
    const res = await owner.patch(`/api/v1/crew/members/${m.id}`, { role: "crew_chief" });
    expect(res.status).toBe(200);
    const row = await testDb()("memberships").where({ organisation_id: orgId, user_id: m.id }).first();
    expect(row.role).toBe("crew_chief");
    const audit = await testDb()("audit_log").where({ organisation_id: orgId, action: "member.role_changed" }).first();
    expect(JSON.parse(typeof audit.details === "string" ? audit.details : JSON.stringify(audit.details))).toEqual({ from: "mechanic", to: "crew_chief" });
  });

  it("keeps the last owner: no demotion, no removal", async () => {
    const { orgId, owner, ownerId } = await freshCrew();
    const demote = await owner.patch(`/api/v1/crew/members/${ownerId}`, { role: "manager" });
    expect(demote.status).toBe(409);
    const remove = await owner.delete(`/api/v1/crew/members/${ownerId}`);
    expect(remove.status).toBe(409);
    expect((await testDb()("memberships").where({ organisation_id: orgId, user_id: ownerId }).first()).role).toBe("owner");
  });

  it("lets an owner step down once there is another owner", async () => {
    const { orgId, owner, ownerId } = await freshCrew();
    const second = await member(orgId, "owner");
    expect((await owner.patch(`/api/v1/crew/members/${ownerId}`, { role: "manager" })).status).toBe(200);
    expect((await second.client.delete(`/api/v1/crew/members/${ownerId}`)).status).toBe(200);
    expect(await testDb()("memberships").where({ organisation_id: orgId, user_id: ownerId }).first()).toBeUndefined();
  });

  it("answers 404 for a member of another organisation", async () => {
    const { owner } = await freshCrew();
    const kestrelMechanic = await testDb()("users").where({ email: DEMO.mechanic }).first("id");
    const res = await owner.patch(`/api/v1/crew/members/${kestrelMechanic.id}`, { role: "viewer" });
    expect(res.status).toBe(404);
    const still = await testDb()("memberships as m").join("organisations as o", "o.id", "m.organisation_id").where({ "m.user_id": kestrelMechanic.id, "o.slug": "kestrel-hollow" }).first("m.role");
    expect(still.role).toBe("mechanic");
  });

  it("hides e-mail addresses from viewers", async () => {
    const viewer = await signedIn(DEMO.viewer);
    const res = await viewer.get("/api/v1/crew/members");
    expect(res.status).toBe(200);
    expect(res.body.members.every((m: { email: string | null }) => m.email === null)).toBe(true);
  });
});
