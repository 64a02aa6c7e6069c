import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser, signInAs } from "../support/browser.ts";
import { BASE_URL, DEMO } from "../support/api.ts";
import { clearSignInAttempts } from "../support/db.ts";
import { SECTIONS } from "../../src/lib/sections.ts";
import { can } from "../../src/lib/permissions.ts";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});
beforeEach(async () => {
  await clearSignInAttempts();
});

const CASES = [
  [DEMO.owner, "owner"],
  [DEMO.manager, "manager"],
  [DEMO.chief, "crew_chief"],
  [DEMO.mechanic, "mechanic"],
  [DEMO.viewer, "viewer"],
] as const;

describe("the shell in a browser", () => {
  it.each(CASES)("%s signs in, sees the sections of the role, the Crew page, and signs out", async (email, role) => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } });
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await signInAs(page, BASE_URL, email);
    expect((await page.locator("h1").textContent())?.trim()).toBe("Kestrel Hollow Racing");
    const nav = await page.getByRole("navigation", { name: "Sections" }).getByRole("link").allTextContents();
    const expected = SECTIONS.filter((s) => can({ role }, s.permission)).map((s) => s.name);
    expect(nav.map((n) => n.trim())).toEqual(expected);
    await page.getByRole("navigation", { name: "Sections" }).getByRole("link", { name: "Crew" }).click();
    await page.waitForURL(/\/crew$/);
    expect(await page.getByTestId("member-list").locator("li").count()).toBe(8);
    const inviteVisible = await page.getByRole("button", { name: "Send invitation" }).isVisible();
    expect(inviteVisible).toBe(role === "owner");
    await page.locator("summary").click();
    await page.getByRole("button", { name: "Sign out", exact: true }).click();
    await page.waitForURL(/\/sign-in\?signedOut=1/);
    await page.goto(`${BASE_URL}/crew`);
    await page.waitForURL(/\/sign-in/);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("shows a wrong password as a plain message and keeps the e-mail typed", async () => {
    const page = await browser.newPage();
    await page.goto(`${BASE_URL}/sign-in`);
    await page.getByLabel("E-mail").fill(DEMO.owner);
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByTestId("sign-in-error").waitFor();
    expect(await page.getByTestId("sign-in-error").textContent()).toContain("do not match");
    expect(await page.getByLabel("E-mail").inputValue()).toBe(DEMO.owner);
    await page.close();
  });

  it("refuses a form post from another site", async () => {
    const res = await fetch(`${BASE_URL}/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded", origin: "https://elsewhere.example" },
      body: "email=owner%40ringland.example&password=ringland-demo",
      redirect: "manual",
    });
    expect(res.status).toBe(403);
  });
});
