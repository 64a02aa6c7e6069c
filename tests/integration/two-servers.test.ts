import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { ApiClient, BASE_URL } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { addMember, createOrganisation, createUser, uniqueSuffix } from "../factories/people.ts";
import { SERVER_ENTRY } from "../../scripts/lib/stack.ts";
import { freePort, httpOk, startChild, waitFor, type Child } from "../../scripts/lib/processes.ts";

// Two app servers side by side on loopback against the same database, as behind a load balancer:
// server A is the one the suite runs against (RINGLAND_BASE_URL), server B is a second process of
// the same build started here. Sessions and sign-in failures live in MariaDB, so either server
// must honour what the other wrote. (One job runner among several: signals-job.test.ts.)

const PASSWORD = "a-long-two-servers-password";
let serverB: Child | null = null;
let baseB = "";

beforeAll(async () => {
  const port = await freePort();
  const env: NodeJS.ProcessEnv = { ...process.env, NODE_ENV: "production", HOST: "127.0.0.1", PORT: String(port) };
  delete env.NODE_OPTIONS;
  serverB = startChild("server-b", [SERVER_ENTRY], env, { quiet: true });
  baseB = `http://localhost:${port}`;
  await waitFor("second app server", () => httpOk(`${baseB}/api/health`), serverB, 60_000);
});

afterAll(async () => {
  await serverB?.stop();
});

beforeEach(async () => {
  await clearSignInAttempts();
});

/** A request to server B, sent the way ApiClient sends to server A (Origin on writes, JSON bodies). */
async function callB(method: "GET" | "POST", path: string, cookie: string | null, body?: unknown): Promise<{ status: number; body: any; setCookie: string[] }> {
  const headers: Record<string, string> = {};
  if (cookie) headers.cookie = cookie;
  if (method === "POST") {
    headers.origin = new URL(baseB).origin;
    headers["content-type"] = "application/json";
  }
  const res = await fetch(baseB + path, { method, headers, body: method === "POST" ? JSON.stringify(body ?? {}) : undefined, redirect: "manual" });
  const text = await res.text();
  return { status: res.status, body: (res.headers.get("content-type") ?? "").includes("json") && text ? JSON.parse(text) : text, setCookie: res.headers.getSetCookie() };
}

async function crewOwner(): Promise<{ email: string; userId: string }> {
  const s = uniqueSuffix();
  const orgId = await createOrganisation(testDb(), { name: `Two servers ${s}`, slug: `two-servers-${s}` });
  const email = `two-servers-${s}@test.example`;
  const userId = await createUser(testDb(), { email, name: `Owner ${s}`, password: PASSWORD });
  await addMember(testDb(), orgId, userId, "owner");
  return { email, userId };
}

describe("two app servers on one database", () => {
  it("are two processes of the same build on different ports", async () => {
    expect(new URL(baseB).port).not.toBe(new URL(BASE_URL).port);
    expect(serverB?.process.pid).toBeGreaterThan(0);
    const [a, b] = await Promise.all([fetch(`${BASE_URL}/api/health`), fetch(`${baseB}/api/health`)]);
    expect([a.status, b.status]).toEqual([200, 200]);
  });

  it("serve the same signed-in person: signed in on A, the cookie works on B; signed out on B, A answers 401", async () => {
    const { email, userId } = await crewOwner();
    const a = new ApiClient();
    await a.signIn(email, PASSWORD);
    const cookie = a.cookieHeader();
    const onA = await a.get("/api/v1/crew/members");
    expect(onA.status).toBe(200);

    const onB = await callB("GET", "/api/v1/crew/members", cookie);
    expect(onB.status).toBe(200);
    expect(onB.body).toEqual(onA.body);
    expect(JSON.stringify(onB.body)).toContain(email);

    const out = await callB("POST", "/api/auth/sign-out", cookie, {});
    expect(out.status).toBe(200);
    expect(await testDb()("sessions").where({ user_id: userId })).toHaveLength(0);
    const afterOnA = await a.get("/api/v1/crew/members");
    expect(afterOnA.status).toBe(401);
    expect((await callB("GET", "/api/v1/crew/members", cookie)).status).toBe(401);
  });

  it("serve the same signed-in person the other way round: signed in on B, the cookie works on A", async () => {
    const { email } = await crewOwner();
    const signIn = await callB("POST", "/api/auth/sign-in", null, { email, password: PASSWORD });
    expect(signIn.status).toBe(200);
    const session = signIn.setCookie.map((c) => c.split(";")[0]).find((c) => c.startsWith("ringland_session="));
    expect(session).toBeDefined();
    const a = new ApiClient();
    const [name, value] = session!.split("=");
    a.cookies.set(name, value);
    expect((await a.get("/api/v1/crew/members")).status).toBe(200);
  });

  it("share the sign-in rate limit: five failures split across A and B lock the account on both", async () => {
    const { email } = await crewOwner();
    for (let i = 0; i < 3; i += 1) {
      expect((await new ApiClient().post("/api/auth/sign-in", { email, password: "wrong-password-x" })).status).toBe(401);
    }
    for (let i = 0; i < 2; i += 1) {
      expect((await callB("POST", "/api/auth/sign-in", null, { email, password: "wrong-password-x" })).status).toBe(401);
    }
    const lockedA = await new ApiClient().post("/api/auth/sign-in", { email, password: PASSWORD });
    const lockedB = await callB("POST", "/api/auth/sign-in", null, { email, password: PASSWORD });
    expect(lockedA.status).toBe(429);
    expect(lockedB.status).toBe(429);
    expect(await testDb()("sign_in_attempts").where({ scope: "account", subject: email })).toHaveLength(5);
  });

  it("do not lock an account on four failures split across A and B", async () => {
    const { email } = await crewOwner();
    for (let i = 0; i < 2; i += 1) {
      expect((await new ApiClient().post("/api/auth/sign-in", { email, password: "wrong-password-x" })).status).toBe(401);
      expect((await callB("POST", "/api/auth/sign-in", null, { email, password: "wrong-password-x" })).status).toBe(401);
    }
    expect((await callB("POST", "/api/auth/sign-in", null, { email, password: PASSWORD })).status).toBe(200);
  });
});
