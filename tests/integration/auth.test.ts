import { beforeEach, describe, expect, it } from "vitest";
import { ApiClient, DEMO, MAIL_INBOX_URL, signedIn } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { waitForMessages, listMessages } from "../support/mail-catcher-client.ts";
import { createUser, uniqueSuffix } from "../factories/people.ts";

const ROLES_BY_EMAIL = [
  [DEMO.owner, "owner"],
  [DEMO.manager, "manager"],
  [DEMO.chief, "crew_chief"],
  [DEMO.mechanic, "mechanic"],
  [DEMO.viewer, "viewer"],
] as const;

async function freshUser(password = "a-long-test-password"): Promise<{ email: string; userId: string }> {
  const email = `person-${uniqueSuffix()}@test.example`;
  const userId = await createUser(testDb(), { email, name: "Test Person", password });
  return { email, userId };
}

beforeEach(async () => {
  await clearSignInAttempts();
});

describe("sign-in", () => {
  it.each(ROLES_BY_EMAIL)("signs in %s and sets a HttpOnly, SameSite=Lax session cookie", async (email) => {
    const c = new ApiClient();
    const res = await c.post("/api/auth/sign-in", { email, password: "ringland-demo" });
    expect(res.status).toBe(200);
    const cookie = c.setCookieLines.find((l) => l.startsWith("ringland_session="))!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    const members = await c.get("/api/v1/crew/members");
    expect(members.status).toBe(200);
  });

  it("gives the same answer for a wrong password and an unknown e-mail", async () => {
    const wrongPassword = await new ApiClient().post("/api/auth/sign-in", { email: DEMO.owner, password: "not-the-password" });
    const unknown = await new ApiClient().post("/api/auth/sign-in", { email: "nobody@ringland.example", password: "not-the-password" });
    expect(wrongPassword.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrongPassword.body.error.message).toBe(unknown.body.error.message);
  });

  it("names each bad field with 400 and refuses other content types with 415", async () => {
    const res = await new ApiClient().post("/api/auth/sign-in", { email: "not-an-email", password: 5, extra: true });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(["body", "email", "password"].sort());
    const form = await new ApiClient().request("POST", "/api/auth/sign-in", "email=a&password=b", {
      "content-type": "application/x-www-form-urlencoded",
      origin: process.env.RINGLAND_BASE_URL ?? "http://localhost:4321",
    });
    expect(form.status).toBe(415);
  });

  it("locks an account after five failures, even for the right password, and keeps the lock in the database", async () => {
    const { email } = await freshUser();
    for (let i = 0; i < 5; i += 1) {
      const res = await new ApiClient().post("/api/auth/sign-in", { email, password: "wrong-password-x" });
      expect(res.status).toBe(401);
    }
    const locked = await new ApiClient().post("/api/auth/sign-in", { email, password: "a-long-test-password" });
    expect(locked.status).toBe(429);
    expect(locked.headers.get("retry-after")).toBe("900");
    const rows = await testDb()("sign_in_attempts").where({ scope: "account", subject: email });
    expect(rows).toHaveLength(5);
  });

  it("limits failures per address across accounts", async () => {
    for (let i = 0; i < 20; i += 1) {
      await new ApiClient().post("/api/auth/sign-in", { email: `spray-${i}@test.example`, password: "wrong-password-x" });
    }
    const res = await new ApiClient().post("/api/auth/sign-in", { email: DEMO.owner, password: "ringland-demo" });
    expect(res.status).toBe(429);
  });

  it("issues a new session id at sign-in and ends the one it replaces", async () => {
    const c = await signedIn(DEMO.mechanic);
    const before = c.cookies.get("ringland_session")!;
    await c.signIn(DEMO.mechanic);
    const after = c.cookies.get("ringland_session")!;
    expect(after).not.toBe(before);
    expect(await testDb()("sessions").where({ id: before }).first()).toBeUndefined();
  });

  it("treats a malformed cookie as no session", async () => {
    const c = new ApiClient();
    c.cookies.set("ringland_session", "'; DROP TABLE users; --");
    const res = await c.get("/api/v1/crew/members");
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe("unauthorized");
  });
});

describe("sessions", () => {
  it("refuses an expired session", async () => {
    const c = await signedIn(DEMO.chief);
    await testDb()("sessions").where({ id: c.cookies.get("ringland_session") }).update({ expires_at: new Date(Date.now() - 1000) });
    expect((await c.get("/api/v1/crew/members")).status).toBe(401);
  });

  it("slides a session that is used in its second half", async () => {
    const c = await signedIn(DEMO.chief);
    const id = c.cookies.get("ringland_session")!;
    const soon = new Date(Date.now() + 2 * 86_400_000);
    await testDb()("sessions").where({ id }).update({ expires_at: soon });
    expect((await c.get("/api/v1/crew/members")).status).toBe(200);
    const row = await testDb()("sessions").where({ id }).first();
    expect(new Date(row.expires_at).getTime()).toBeGreaterThan(Date.now() + 29 * 86_400_000);
    expect(c.setCookieLines.some((l) => l.startsWith("ringland_session="))).toBe(true);
  });

  it("signs out one session, or every session of the person", async () => {
    const a = await signedIn(DEMO.viewer);
    const b = await signedIn(DEMO.viewer);
    const c = await signedIn(DEMO.viewer);
    expect((await a.post("/api/auth/sign-out", {})).status).toBe(200);
    expect((await a.get("/api/v1/crew/members")).status).toBe(401);
    expect((await b.get("/api/v1/crew/members")).status).toBe(200);
    expect((await b.post("/api/auth/sign-out", { everywhere: true })).status).toBe(200);
    expect((await c.get("/api/v1/crew/members")).status).toBe(401);
  });
});

describe("password reset", () => {
  it("mails a single-use link that sets a new password and ends old sessions", async () => {
    const { email } = await freshUser();
    const old = await signedIn(email, "a-long-test-password");
    const res = await new ApiClient().post("/api/auth/reset-request", { email });
    expect(res.status).toBe(200);
    const [mail] = await waitForMessages(MAIL_INBOX_URL, (m) => m.to.includes(email), 10_000);
    const token = /\/reset\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];
    const bad = await new ApiClient().post("/api/auth/reset", { token, password: "short" });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.password).toBeTruthy();
    const ok = await new ApiClient().post("/api/auth/reset", { token, password: "a-brand-new-password" });
    expect(ok.status).toBe(200);
    const again = await new ApiClient().post("/api/auth/reset", { token, password: "another-new-password" });
    expect(again.status).toBe(400);
    expect(again.body.error.fields.token).toBeTruthy();
    expect((await old.get("/api/v1/crew/members")).status).toBe(401);
    await signedIn(email, "a-brand-new-password");
  });

  it("refuses an expired link", async () => {
    const { email, userId } = await freshUser();
    await new ApiClient().post("/api/auth/reset-request", { email });
    const [mail] = await waitForMessages(MAIL_INBOX_URL, (m) => m.to.includes(email), 10_000);
    const token = /\/reset\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];
    await testDb()("password_resets").where({ user_id: userId }).update({ expires_at: new Date(Date.now() - 1000) });
    const res = await new ApiClient().post("/api/auth/reset", { token, password: "a-brand-new-password" });
    expect(res.status).toBe(400);
  });

  it("answers the same for an unknown e-mail and sends nothing", async () => {
    const email = `ghost-${uniqueSuffix()}@test.example`;
    const res = await new ApiClient().post("/api/auth/reset-request", { email });
    expect(res.status).toBe(200);
    await new Promise((r) => setTimeout(r, 500));
    expect(await listMessages(MAIL_INBOX_URL, { to: email })).toHaveLength(0);
  });
});

describe("organisations", () => {
  it("lets a member of two organisations switch, and shows each one only its own crew", async () => {
    const c = await signedIn(DEMO.manager);
    const orgs = await testDb()("organisations").whereIn("slug", ["kestrel-hollow", "larchwind-trail"]).select("id", "slug");
    const larch = orgs.find((o) => o.slug === "larchwind-trail")!.id;
    const kestrel = orgs.find((o) => o.slug === "kestrel-hollow")!.id;
    expect((await c.post("/api/auth/switch-organisation", { organisationId: larch })).status).toBe(200);
    const larchCrew = await c.get("/api/v1/crew/members");
    expect(larchCrew.body.members.map((m: { email: string }) => m.email)).toContain("nell@larchwind.example");
    expect(larchCrew.body.members.map((m: { email: string }) => m.email)).not.toContain(DEMO.owner);
    await c.post("/api/auth/switch-organisation", { organisationId: kestrel });
    const kestrelCrew = await c.get("/api/v1/crew/members");
    expect(kestrelCrew.body.members.map((m: { email: string }) => m.email)).toContain(DEMO.owner);
  });

  it("refuses to switch into an organisation the person is not in", async () => {
    const c = await signedIn(DEMO.viewer);
    const larch = await testDb()("organisations").where({ slug: "larchwind-trail" }).first("id");
    const res = await c.post("/api/auth/switch-organisation", { organisationId: larch.id });
    expect(res.status).toBe(404);
  });
});

