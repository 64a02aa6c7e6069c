import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launchBrowser, signInAs } from "../support/browser.ts";
import { BASE_URL, DEMO, signedIn } from "../support/api.ts";
import { clearSignInAttempts } from "../support/db.ts";

// The Workbench in Chromium: type, switch units, plan a cut, see the fuel check with its
// cautions, reload the address and find the same state; at desktop width and at 390 px.
// With RINGLAND_SCREENSHOTS=/some/prefix- it also writes screenshots for a person to look at.

const SHOTS = process.env.RINGLAND_SCREENSHOTS;
const WHO = DEMO.chief;

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  // Leave the demo person following the organisation's units again.
  await clearSignInAttempts();
  const api = await signedIn(WHO);
  await api.patch("/api/v1/me/preferences", { unitSystem: null, unitChoices: null });
});
beforeEach(async () => {
  await clearSignInAttempts();
});

async function text(page: Page, testId: string): Promise<string> {
  return ((await page.getByTestId(testId).first().textContent()) ?? "").trim();
}

async function pickUnit(page: Page, quantity: string, unit: string): Promise<void> {
  await page.locator(`label[for="unit-${quantity}-${unit}"]`).click();
  await page.getByTestId("unit-status").filter({ hasText: "Saved" }).waitFor();
}

/** Typing before React has hydrated the island would be lost: wait for Astro to mark it hydrated. */
async function waitForIsland(page: Page): Promise<void> {
  await page.locator("astro-island:not([ssr])").first().waitFor({ state: "attached" });
}

async function fill(page: Page, label: string, value: string): Promise<void> {
  await page.getByLabel(label, { exact: true }).fill(value);
}

async function expectNoSideways(page: Page): Promise<void> {
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  expect(overflow).toBeLessThanOrEqual(0);
}

async function shoot(page: Page, name: string): Promise<void> {
  if (SHOTS) await page.screenshot({ path: `${SHOTS}${name}.png`, fullPage: true });
}

describe("the Workbench in a browser", () => {
  it("computes as you type, converts units, plans a cut, checks the fuel and survives a reload", async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await signInAs(page, BASE_URL, WHO);
    await page.getByRole("navigation", { name: "Sections" }).getByRole("link", { name: "Workbench" }).click();
    await page.waitForURL(/\/workbench/);
    await waitForIsland(page);
    await page.getByTestId("figures-missing").waitFor();

    // The organisation is imperial in the demo seed; the shop elevation (366 m) starts the fuel check.
    expect(await page.locator("#unit-length-in").isChecked()).toBe(true);
    expect(await page.getByLabel("Elevation", { exact: true }).inputValue()).toBe("1200.8");
    await page.getByRole("button", { name: "All metric" }).click();
    await page.getByTestId("unit-status").filter({ hasText: "Saved" }).waitFor();
    expect(await page.getByLabel("Elevation", { exact: true }).inputValue()).toBe("366");

    // DEMO.md engine A-1: 72 × 73.8 mm, rod 130, exhaust opens 82° ATDC, 23.6 cc, flat plate 26.4 cc
    await fill(page, "Bore", "72");
    await fill(page, "Stroke", "73.8");
    await fill(page, "Rod length", "130");
    await fill(page, "Cylinders", "2");
    await fill(page, "Installed chamber volume", "23.6");
    await fill(page, "Flat-plate head volume", "26.4");
    await fill(page, "Squish clearance", "1.2");
    await fill(page, "Exhaust opens", "82");
    expect(await text(page, "geometric-ratio")).toBe("13.73:1");
    expect(await text(page, "trapped-ratio")).toBe("7.38:1");
    expect(await text(page, "swept-volume")).toBe("300.5 cc");
    expect(await text(page, "displacement")).toBe("601.0 cc");
    expect(await text(page, "chamber-offset")).toBe("-2.8 cc");
    expect(await page.getByText("Geometric compression ratio").first().isVisible()).toBe(true);
    expect(await text(page, "measuring-reminders")).toMatch(/ignition disabled/);
    expect(await text(page, "measuring-reminders")).toMatch(/crankcase/);
    expect(await text(page, "measuring-reminders")).toMatch(/hands/i);
    expect(await text(page, "compression-cautions")).toMatch(/trained engine builder/);

    // A bad value is named on its field and the other figures stay.
    await fill(page, "Rod length", "30");
    expect(await page.getByText("Rod length must be longer than half the stroke").isVisible()).toBe(true);
    expect(await text(page, "geometric-ratio")).toBe("13.73:1");
    await fill(page, "Rod length", "130");

    // Switch lengths to inches and back: the typed values follow, the ratios do not move.
    await pickUnit(page, "length", "in");
    expect(await page.getByLabel("Bore", { exact: true }).inputValue()).toBe("2.83465");
    expect(await text(page, "geometric-ratio")).toBe("13.73:1");
    await pickUnit(page, "volume", "in3");
    expect(await text(page, "swept-volume")).toBe("18.336 in³");
    await pickUnit(page, "volume", "cc");
    await pickUnit(page, "length", "mm");
    expect(await page.getByLabel("Bore", { exact: true }).inputValue()).toBe("72");
    expect(await page.getByLabel("Installed chamber volume", { exact: true }).inputValue()).toBe("23.6");

    // Plan a 0.2 mm head cut, then a base gasket 0.1 mm thicker.
    await page.getByRole("button", { name: "+ Cut head face" }).click();
    await fill(page, "Cut the head face by", "0.2");
    await page.getByRole("button", { name: "+ Base gasket" }).click();
    await fill(page, "Change the base gasket by", "0.1");
    // A changed figure says so in words for screen readers as well as in bold.
    expect(await text(page, "after-squish-clearance")).toBe("1.10 mm (changed)");
    const beforeAfter = await text(page, "before-after");
    expect(beforeAfter).toMatch(/As measured/);
    expect(beforeAfter).toMatch(/Trapped compression ratio/);
    // The thicker base gasket lifts the port: it opens earlier than 82°.
    expect(await text(page, "after-exhaust-opens")).toMatch(/^81\.\d° ATDC \(changed\)$/);
    expect(await text(page, "machining-cautions")).toMatch(/measure the chamber again/i);

    // The fuel check at DEMO.md's Birchmoor (396 m) on a cold day.
    await fill(page, "Elevation", "396");
    await fill(page, "Air temperature", "-5");
    await page.getByTestId("fuel-before").waitFor();
    expect(await text(page, "fuel-before-cranking")).toMatch(/^\d+\.\d kPa$/);
    expect(await text(page, "fuel-after-cranking")).toMatch(/^\d+\.\d kPa$/);
    expect(await text(page, "fuel-before-density-altitude")).toMatch(/^-?\d+ m$/);
    expect(await text(page, "fuel-table-label")).toMatch(/Common-practice defaults/);
    const cautions = await text(page, "fuel-cautions");
    expect(cautions).toMatch(/Detonation/);
    expect(cautions).toMatch(/fire codes/);
    expect(cautions).toMatch(/sanctioning rules/);
    expect(await page.getByTestId("fuel-table").getByText("applies").count()).toBe(1);

    // The address holds the state: reload and find everything again.
    const url = page.url();
    expect(url).toMatch(/bore=72/);
    expect(url).toMatch(/plan=cut%3A0.2%2Cgasket%3A0.1/);
    await shoot(page, "1280");
    await page.emulateMedia({ media: "print" });
    await shoot(page, "print");
    await page.emulateMedia({ media: "screen" });
    await page.reload();
    await page.getByTestId("fuel-before").waitFor();
    expect(page.url()).toBe(url);
    expect(await page.getByLabel("Bore", { exact: true }).inputValue()).toBe("72");
    expect(await page.getByLabel("Cut the head face by", { exact: true }).inputValue()).toBe("0.2");
    expect(await text(page, "geometric-ratio")).toBe("13.73:1");
    expect(await text(page, "after-squish-clearance")).toBe("1.10 mm (changed)");
    const cranking = await text(page, "fuel-before-cranking");
    expect(errors).toEqual([]);
    await page.close();

    // The same address on a phone: same figures, nothing wider than the screen.
    const phone = await browser.newPage({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });
    await signInAs(phone, BASE_URL, WHO);
    await phone.goto(url);
    await waitForIsland(phone);
    await phone.getByTestId("fuel-before").waitFor();
    expect(await text(phone, "geometric-ratio")).toBe("13.73:1");
    expect(await text(phone, "fuel-before-cranking")).toBe(cranking);
    expect(await phone.getByRole("button", { name: "Copy link to this result" }).isVisible()).toBe(true);
    await expectNoSideways(phone);
    await shoot(phone, "390");
    // Scrolled to the exhaust port: the ratios stay in sight above the fields being typed.
    await phone.getByLabel("Exhaust opens", { exact: true }).scrollIntoViewIfNeeded();
    expect(await phone.getByTestId("live-strip").isVisible()).toBe(true);
    if (SHOTS) await phone.screenshot({ path: `${SHOTS}390-scrolled.png` });
    if (SHOTS) {
      await phone.emulateMedia({ colorScheme: "dark" });
      await phone.evaluate(() => document.documentElement.classList.add("dark"));
      await phone.getByTestId("fuel-before").scrollIntoViewIfNeeded();
      await phone.screenshot({ path: `${SHOTS}390-dark.png` });
    }
    await phone.close();
  });

  it("opens in the person's saved units", async () => {
    const api = await signedIn(WHO);
    await api.patch("/api/v1/me/preferences", { unitSystem: "metric", unitChoices: { pressure: "psi", elevation: "ft" } });
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } });
    await signInAs(page, BASE_URL, WHO);
    await page.goto(`${BASE_URL}/workbench`);
    await waitForIsland(page);
    expect(await page.locator("#unit-length-mm").isChecked()).toBe(true);
    expect(await page.locator("#unit-pressure-psi").isChecked()).toBe(true);
    expect(await page.locator("#unit-elevation-ft").isChecked()).toBe(true);
    await fill(page, "Bore", "72");
    await fill(page, "Stroke", "73.8");
    await fill(page, "Installed chamber volume", "23.6");
    await page.getByTestId("fuel-before").waitFor();
    expect(await text(page, "fuel-before-cranking")).toMatch(/^\d+\.\d psi$/);
    // Without exhaust timing the estimate rests on the geometric ratio, and says so.
    expect(await text(page, "fuel-before-flags")).toMatch(/geometric ratio/);
    await expectNoSideways(page);
    await page.close();
  });
});
