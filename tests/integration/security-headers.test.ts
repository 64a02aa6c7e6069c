import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { ApiClient, BASE_URL, DEMO, signedIn } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { launchBrowser, signInAs } from "../support/browser.ts";
import { createUser, uniqueSuffix } from "../factories/people.ts";
import { SERVER_ENTRY } from "../../scripts/lib/stack.ts";
import { freePort, httpOk, startChild, waitFor, type Child } from "../../scripts/lib/processes.ts";

// Headers, cookies and cross-site requests: the content security policy the pages really run
// under (no violation in Chromium on the busiest pages, and a refused foreign script to prove it is on),
// frame denial, no server banner, the session cookie's flags (Secure from a second server started
// with SECURE_COOKIES=true), Astro's origin check on form posts, no adopted session id, and reset
// links that live 30 minutes (single use is proven in auth.test.ts).

const EVIL = "https://evil.example";
let owner: ApiClient;
let engineId: number;

beforeAll(async () => {
  await clearSignInAttempts();
  owner = await signedIn(DEMO.owner);
  const row = await testDb()("engines as e").join("organisations as o", "o.id", "e.organisation_id").where("o.slug", "kestrel-hollow").whereNull("e.archived_at").orderBy("e.id").first("e.id");
  engineId = Number(row.id);
});

beforeEach(async () => {
  await clearSignInAttempts();
});

async function head(path: string, client: ApiClient | null): Promise<Response> {
  return fetch(BASE_URL + path, { headers: client ? { cookie: client.cookieHeader() } : {}, redirect: "manual" });
}

function directives(csp: string): Map<string, string> {
  return new Map(csp.split(";").map((d) => d.trim()).filter(Boolean).map((d) => [d.split(/\s+/)[0], d.slice(d.indexOf(" ") + 1)]));
}

function expectNoBanner(res: Response, what: string): void {
  expect(res.headers.get("x-powered-by"), `${what}: x-powered-by`).toBeNull();
  const server = res.headers.get("server");
  expect(server === null || !/\d/.test(server), `${what}: server ${server}`).toBe(true);
}

describe("response headers", () => {
  const PAGES = ["/", "/motors", "/season", "/workbench", "/signals", "/crew"];

  it("pages carry the policy, frame denial and no banner", async () => {
    for (const path of [...PAGES, `/motors/${engineId}`]) {
      const res = await head(path, owner);
      expect(res.status, path).toBe(200);
      const csp = directives(res.headers.get("content-security-policy") ?? "");
      expect(csp.get("default-src"), path).toBe("'self'");
      expect(csp.get("object-src"), path).toBe("'none'");
      expect(csp.get("frame-ancestors"), path).toBe("'none'");
      expect(csp.get("base-uri"), path).toBe("'self'");
      expect(csp.get("form-action"), path).toBe("'self'");
      expect(csp.get("script-src"), path).not.toMatch(/unsafe-eval|\*|https?:/);
      expect(res.headers.get("x-frame-options"), path).toBe("DENY");
      expect(res.headers.get("x-content-type-options"), path).toBe("nosniff");
      expect(res.headers.get("referrer-policy"), path).toBe("same-origin");
      expectNoBanner(res, path);
    }
    const signIn = await head("/sign-in", null);
    expect(directives(signIn.headers.get("content-security-policy") ?? "").get("frame-ancestors")).toBe("'none'");
    expectNoBanner(signIn, "/sign-in");
  });

  it("API answers, errors included, are locked down further and carry no banner", async () => {
    const cases: [string, ApiClient | null, number][] = [
      ["/api/health", null, 200],
      ["/api/v1/engines", owner, 200],
      ["/api/v1/engines", null, 401],
      ["/api/v1/engines/999999999", owner, 404],
      ["/api/v1/calc/atmosphere?elevationM=NaN", owner, 400],
    ];
    for (const [path, client, status] of cases) {
      const res = await head(path, client);
      expect(res.status, path).toBe(status);
      expect(res.headers.get("content-security-policy"), path).toBe("default-src 'none'; frame-ancestors 'none'");
      expect(res.headers.get("x-frame-options"), path).toBe("DENY");
      expect(res.headers.get("x-content-type-options"), path).toBe("nosniff");
      expectNoBanner(res, path);
    }
  });

  it("static assets and unknown paths carry no banner either", async () => {
    const page = await (await head("/sign-in", null)).text();
    const asset = /(?:src|href)="(\/_astro\/[^"]+)"/.exec(page)?.[1];
    expect(asset, "the sign-in page loads a built asset").toBeTruthy();
    const res = await head(asset!, null);
    expect(res.status).toBe(200);
    expectNoBanner(res, asset!);
    const missing = await head("/no-such-page", owner);
    expect(missing.status).toBe(404);
    expectNoBanner(missing, "/no-such-page");
    expect(missing.headers.get("x-frame-options")).toBe("DENY");
  });
});

describe("the policy in a browser", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("Overview, Season, Workbench and an engine file raise no violation; a script from another site is refused", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    await context.addInitScript(() => {
      const seen: string[] = [];
      (window as unknown as { __csp: string[] }).__csp = seen;
      document.addEventListener("securitypolicyviolation", (e) => seen.push(`${e.violatedDirective} ${e.blockedURI}`));
    });
    const page = await context.newPage();
    const consoleLines: string[] = [];
    page.on("console", (m) => {
      if (/Content.Security.Policy|Refused to/i.test(m.text())) consoleLines.push(m.text());
    });
    const pageErrors: string[] = [];
    page.on("pageerror", (e) => pageErrors.push(e.message));
    await signInAs(page, BASE_URL, DEMO.owner);
    for (const path of ["/", "/season", "/workbench", `/motors/${engineId}`]) {
      await page.goto(BASE_URL + path, { waitUntil: "networkidle" });
      // Islands that load at once have hydrated; scrolling wakes the ones that wait to be seen.
      await page.waitForFunction(() => [...document.querySelectorAll("astro-island[client='load']")].every((e) => !e.hasAttribute("ssr")));
      await page.mouse.wheel(0, 4000);
      await page.waitForTimeout(500);
      const seen = await page.evaluate(() => (window as unknown as { __csp: string[] }).__csp);
      expect(seen, `${path}: violations`).toEqual([]);
      expect(consoleLines, `${path}: console`).toEqual([]);
    }
    expect(pageErrors).toEqual([]);
    // The same listener does hear a violation: a script from another site is refused.
    await page.evaluate((src) => {
      const el = document.createElement("script");
      el.src = src;
      document.head.append(el);
    }, `${EVIL}/x.js`);
    await page.waitForFunction(() => (window as unknown as { __csp: string[] }).__csp.length > 0);
    expect(await page.evaluate(() => (window as unknown as { __csp: string[] }).__csp)).toEqual([`script-src-elem ${EVIL}/x.js`]);
    await context.close();
  });
});

describe("the session cookie", () => {
  it("is HttpOnly, SameSite=Lax, for the whole site, and not Secure on plain http by default", async () => {
    const c = new ApiClient();
    await c.signIn(DEMO.viewer);
    const line = c.setCookieLines.find((l) => l.startsWith("ringland_session="))!;
    expect(line).toMatch(/;\s*HttpOnly/i);
    expect(line).toMatch(/;\s*SameSite=Lax/i);
    expect(line).toMatch(/;\s*Path=\//i);
    expect(line).not.toMatch(/;\s*Secure/i);
    expect(line).toMatch(/Max-Age=\d+|Expires=/i);
  });

  it("is Secure from a server started with SECURE_COOKIES=true", async () => {
    const port = await freePort();
    const env: NodeJS.ProcessEnv = { ...process.env, NODE_ENV: "production", HOST: "127.0.0.1", PORT: String(port), SECURE_COOKIES: "true" };
    delete env.NODE_OPTIONS;
    let server: Child | null = null;
    try {
      server = startChild("secure-cookies", [SERVER_ENTRY], env, { quiet: true });
      const base = `http://localhost:${port}`;
      await waitFor("server with SECURE_COOKIES=true", () => httpOk(`${base}/api/health`), server, 60_000);
      const res = await fetch(`${base}/api/auth/sign-in`, {
        method: "POST",
        headers: { "content-type": "application/json", origin: base },
        body: JSON.stringify({ email: DEMO.viewer, password: "ringland-demo" }),
      });
      expect(res.status).toBe(200);
      const line = res.headers.getSetCookie().find((l) => l.startsWith("ringland_session="))!;
      expect(line).toMatch(/;\s*Secure/i);
      expect(line).toMatch(/;\s*HttpOnly/i);
      expect(line).toMatch(/;\s*SameSite=Lax/i);
    } finally {
      await server?.stop();
    }
  });

  it("never adopts an id the browser brought: sign-in issues its own, and the planted one stays unknown", async () => {
    const planted = "a".repeat(40);
    const c = new ApiClient();
    c.cookies.set("ringland_session", planted);
    await c.signIn(DEMO.viewer);
    const issued = c.cookies.get("ringland_session")!;
    expect(issued).not.toBe(planted);
    expect(issued).toMatch(/^[a-z0-9]{20,64}$/i);
    expect(await testDb()("sessions").where({ id: planted }).first()).toBeUndefined();
    const attacker = new ApiClient();
    attacker.cookies.set("ringland_session", planted);
    expect((await attacker.get("/api/v1/crew/members")).status).toBe(401);
  });
});

describe("password reset links", () => {
  it("live 30 minutes, and only their hash is stored", async () => {
    const s = uniqueSuffix();
    const email = `reset-${s}@test.example`;
    const userId = await createUser(testDb(), { email, name: `Reset ${s}`, password: "a-long-test-password" });
    const before = Date.now();
    expect((await new ApiClient().post("/api/auth/reset-request", { email })).status).toBe(200);
    const after = Date.now();
    const row = await testDb()("password_resets").where({ user_id: userId }).first();
    const expires = new Date(row.expires_at).getTime();
    expect(expires).toBeGreaterThanOrEqual(before + 30 * 60_000 - 1000);
    expect(expires).toBeLessThanOrEqual(after + 30 * 60_000 + 1000);
    expect(row.token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(row.used_at).toBeNull();
  });
});

describe("cross-site requests", () => {
  async function formPost(path: string, origin: string, cookie = "", type = "application/x-www-form-urlencoded"): Promise<Response> {
    return fetch(BASE_URL + path, {
      method: "POST",
      headers: { "content-type": type, origin, ...(cookie ? { cookie } : {}) },
      body: `email=${encodeURIComponent(DEMO.viewer)}&password=ringland-demo`,
      redirect: "manual",
    });
  }

  it("refuses a form posted to /sign-in from another site with 403, and takes the same form from this one", async () => {
    const cross = await formPost("/sign-in", EVIL);
    expect(cross.status).toBe(403);
    expect(cross.headers.getSetCookie().some((l) => l.startsWith("ringland_session=") && !/Max-Age=0/.test(l))).toBe(false);
    const same = await formPost("/sign-in", new URL(BASE_URL).origin);
    expect(same.status).not.toBe(403);
    expect(same.headers.getSetCookie().some((l) => l.startsWith("ringland_session="))).toBe(true);
  });

  it("refuses cross-site form posts to the session routes, leaving the session alive", async () => {
    const c = await signedIn(DEMO.viewer);
    const out = await formPost("/session/sign-out", EVIL, c.cookieHeader());
    expect(out.status).toBe(403);
    const multipart = await formPost("/session/switch", EVIL, c.cookieHeader(), "multipart/form-data; boundary=x");
    expect(multipart.status).toBe(403);
    expect((await c.get("/api/v1/crew/members")).status).toBe(200);
  });

  it("JSON routes: a text/plain post from another site is refused (403), one from here too (415); no CORS grant", async () => {
    const c = await signedIn(DEMO.mechanic);
    const body = JSON.stringify({ engineId: 1, occurredOn: "2026-01-01", amount: 1 });
    const cross = await fetch(`${BASE_URL}/api/v1/usage`, { method: "POST", headers: { "content-type": "text/plain", origin: EVIL, cookie: c.cookieHeader() }, body });
    expect(cross.status).toBe(403);
    const here = await fetch(`${BASE_URL}/api/v1/usage`, { method: "POST", headers: { "content-type": "text/plain", origin: new URL(BASE_URL).origin, cookie: c.cookieHeader() }, body });
    expect(here.status).toBe(415);
    const preflight = await fetch(`${BASE_URL}/api/v1/usage`, {
      method: "OPTIONS",
      headers: { origin: EVIL, "access-control-request-method": "POST", "access-control-request-headers": "content-type" },
    });
    expect(preflight.headers.get("access-control-allow-origin")).toBeNull();
    expect(preflight.headers.get("access-control-allow-credentials")).toBeNull();
  });
});
