import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launchBrowser, signInAs } from "../support/browser.ts";
import { BASE_URL, DEMO, signedIn } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { createEngine, createPart } from "../factories/motors.ts";
import { uniqueSuffix } from "../factories/people.ts";

// The Motors pages in Chromium: logging a session and entering a two-cylinder reading set on a
// 390 px phone (rows checked in the database), the engine file's drift charts, the build-sheet
// PDF, and another organisation's engine answering 404.
// With RINGLAND_SCREENSHOTS=/some/prefix- it also writes screenshots for a person to look at.

const SHOTS = process.env.RINGLAND_SCREENSHOTS;
const PHONE = { viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true };
const DESK = { viewport: { width: 1280, height: 900 } };

let browser: Browser;
let kestrelId: number;
let freshEngineId: number;
let freshName: string;
let a2Id: number;

async function engineIdOf(slug: string, name: string): Promise<number> {
  const row = await testDb()("engines as e").join("organisations as o", "o.id", "e.organisation_id").where({ "o.slug": slug, "e.name": name }).first("e.id");
  if (!row) throw new Error(`demo engine ${name} of ${slug} is missing`);
  return Number(row.id);
}

async function expectNoSideways(page: Page): Promise<void> {
  const wide = await page.evaluate(() => {
    const limit = document.documentElement.clientWidth;
    const over = [...document.querySelectorAll("body *")]
      .filter((el) => el.getBoundingClientRect().right > limit + 0.5 && !el.closest("[class*='overflow-x-auto'],[class*='overflow-auto']"))
      .map((el) => `${el.tagName.toLowerCase()}.${String(el.className).slice(0, 60)}`);
    return { overflow: document.documentElement.scrollWidth - limit, over: over.slice(0, 5) };
  });
  expect(wide.overflow, `wider than the screen: ${wide.over.join(" | ")}`).toBeLessThanOrEqual(0);
}

/** Waits until every island that loads at once has hydrated, so typing reaches React. */
async function hydrated(page: Page): Promise<void> {
  await page.waitForFunction(() => [...document.querySelectorAll("astro-island[client='load']")].every((e) => !e.hasAttribute("ssr")));
}

async function shoot(page: Page, name: string, fullPage = true): Promise<void> {
  if (SHOTS) await page.screenshot({ path: `${SHOTS}${name}.png`, fullPage });
}

beforeAll(async () => {
  browser = await launchBrowser();
  kestrelId = Number((await testDb()("organisations").where({ slug: "kestrel-hollow" }).first("id")).id);
  a2Id = await engineIdOf("kestrel-hollow", "A-2");
  freshName = `E2E-${uniqueSuffix()}`.slice(0, 40);
  // A twin of its own (DEMO.md's race 72 × 73.8 mm, rod 130, exhaust opening 82° ATDC), so the demo engines keep their history.
  freshEngineId = await createEngine(testDb(), kestrelId, { name: freshName, status: "running", cylinders: 2, topEndLimit: 8, bottomEndLimit: 24 });
});

afterAll(async () => {
  await browser?.close();
  await testDb()("engines").where({ id: freshEngineId }).update({ archived_at: new Date() });
  await clearSignInAttempts();
  // The forms' unit switches saved these people's units: follow the organisation again.
  for (const who of [DEMO.mechanic, DEMO.chief]) {
    const api = await signedIn(who);
    await api.patch("/api/v1/me/preferences", { unitSystem: null, unitChoices: null });
  }
});

beforeEach(async () => {
  await clearSignInAttempts();
});

describe("Motors in a browser", () => {
  it("logs a session and saves a two-cylinder reading set on a 390 px phone", async () => {
    const page = await browser.newPage(PHONE);
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await signInAs(page, BASE_URL, DEMO.mechanic);

    // Log a session in the pits.
    await page.goto(`${BASE_URL}/motors/usage`);
    await hydrated(page);
    await page.getByLabel("Engine", { exact: true }).selectOption({ label: freshName });
    await page.getByLabel("Ran for (h)").fill("1.5");
    await page.getByLabel("Session", { exact: true }).fill("Practice");
    await page.getByLabel("Event or venue").fill("E2E Flats");
    await expectNoSideways(page);
    await page.getByTestId("log-session-save").click();
    await page.getByTestId("log-session-done").filter({ hasText: "Logged 1.5 h" }).waitFor();
    const usage = await testDb()("usage_entries").where({ engine_id: freshEngineId });
    expect(usage).toHaveLength(1);
    expect(Number(usage[0].amount)).toBe(1.5);
    expect(usage[0].session_label).toBe("Practice");
    expect(usage[0].event_label).toBe("E2E Flats");
    expect(usage[0].source).toBe("manual");
    // The list below the form shows it at once.
    await page.getByTestId("recent-usage").getByText("E2E Flats · Practice").first().waitFor();

    // The reading set, typed in metric.
    await page.goto(`${BASE_URL}/motors/${freshEngineId}/readings/new`);
    await hydrated(page);
    expect(await page.getByTestId("measuring-reminders").textContent()).toMatch(/ignition disabled/);
    expect(await page.getByTestId("measuring-reminders").textContent()).toMatch(/crankcase/);
    await page.getByRole("button", { name: "All metric" }).click();
    await page.getByTestId("unit-status").filter({ hasText: "Saved" }).waitFor();
    // A mechanic records readings; marking a baseline is a crew chief's call.
    expect(await page.getByTestId("baseline-box").count()).toBe(0);

    const c1 = page.getByTestId("cylinder-1");
    const c2 = page.getByTestId("cylinder-2");
    await c1.getByLabel("Reading 1", { exact: true }).fill("23.6");
    await c1.getByLabel("Reading 2", { exact: true }).fill("23.6");
    // DEMO.md engine A-1 at 23.6 cc: 13.73 geometric, 7.38 trapped.
    expect(await page.getByTestId("geometric-1").textContent()).toBe("13.73:1");
    expect(await page.getByTestId("trapped-1").textContent()).toBe("7.38:1");
    await c1.getByLabel("Flat-plate head volume").fill("26.4");
    expect(await page.getByTestId("offset-1").textContent()).toBe("-2.8 cc");
    await c1.getByLabel("Squish, side A").fill("1.20");
    await c1.getByLabel("Squish, side B").fill("1.21");
    await c1.getByLabel("Cranking compression").fill("1006");
    await c1.getByLabel("Leak-down").fill("4");

    // Two readings 0.6 cc apart do not agree; a third that agrees with the first is accepted.
    await c2.getByLabel("Reading 1", { exact: true }).fill("23.4");
    await c2.getByLabel("Reading 2", { exact: true }).fill("24.0");
    expect(await page.getByTestId("agreement-2").textContent()).toMatch(/No two readings agree within 0\.2 cc/);
    expect(await page.getByTestId("geometric-2").textContent()).toBe("—");
    await c2.getByRole("button", { name: "+ Another reading" }).click();
    await c2.getByLabel("Reading 3", { exact: true }).fill("23.5");
    expect(await page.getByTestId("agreement-2").textContent()).toMatch(/Readings 1 and 3 agree: 23\.\d cc accepted\. Reading 2 stands apart\./);
    expect(await page.getByTestId("geometric-2").textContent()).toMatch(/^13\.8\d:1$/);
    await c2.getByLabel("Squish, side A").fill("1.19");
    await c2.getByLabel("Squish, side B").fill("1.22");
    await c2.getByLabel("Cranking compression").fill("1000");
    expect(await page.getByTestId("chamber-spread").textContent()).toMatch(/^0\.\d cc \(0\.\d %\)$/);
    await expectNoSideways(page);

    // Leaving with unsaved readings asks first; staying keeps everything typed.
    const asked = new Promise<string>((resolve) => page.once("dialog", (d) => { resolve(d.type()); void d.dismiss(); }));
    void page.goto(`${BASE_URL}/motors`).catch(() => undefined);
    expect(await asked).toBe("beforeunload");
    expect(page.url()).toMatch(/readings\/new/);
    expect(await c2.getByLabel("Reading 3", { exact: true }).inputValue()).toBe("23.5");

    // The save button is the one action at the bottom of the phone screen.
    const save = page.getByTestId("save-readings");
    const box = await save.boundingBox();
    expect(box).not.toBeNull();
    expect(box!.y + box!.height).toBeGreaterThan(844 - 80);
    expect(box!.y + box!.height).toBeLessThanOrEqual(844);
    await save.click();
    await page.waitForURL(/\/motors\/\d+\?saved=\d+/);
    const setId = Number(new URL(page.url()).searchParams.get("saved"));

    const sets = await testDb()("reading_sets").where({ engine_id: freshEngineId });
    expect(sets).toHaveLength(1);
    expect(Number(sets[0].id)).toBe(setId);
    expect(Boolean(sets[0].is_baseline)).toBe(false);
    expect(sets[0].elevation_m).toBe(366);
    const cylinders = await testDb()("cylinder_readings").where({ reading_set_id: setId }).orderBy("cylinder_no");
    expect(cylinders.map((c) => c.cylinder_no)).toEqual([1, 2]);
    const chambers = cylinders.map((c) => (typeof c.chamber_readings_cc === "string" ? JSON.parse(c.chamber_readings_cc) : c.chamber_readings_cc));
    expect(chambers).toEqual([[23.6, 23.6], [23.4, 24, 23.5]]);
    expect(Number(cylinders[0].flat_plate_cc)).toBe(26.4);
    expect(Number(cylinders[1].squish_a_mm)).toBe(1.19);
    expect(Number(cylinders[1].squish_b_mm)).toBe(1.22);
    expect(Number(cylinders[0].cranking_kpa)).toBe(1006);
    expect(Number(cylinders[0].leakdown_pct)).toBe(4);
    expect(cylinders[1].leakdown_pct).toBeNull();

    // The engine file shows the new set and the session.
    await page.locator(`#set-${setId}`).waitFor();
    expect(await page.locator(`#set-${setId}`).getByTestId("reading-set-table").textContent()).toMatch(/13\.73:1/);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("draws the engine file's drift charts with the baseline, and downloads the build sheet as PDF", async () => {
    const page = await browser.newPage(DESK);
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await signInAs(page, BASE_URL, DEMO.chief);
    await page.goto(`${BASE_URL}/motors`);
    await page.getByTestId("roster-table").getByRole("link", { name: "A-2", exact: true }).click();
    await page.waitForURL(new RegExp(`/motors/${a2Id}$`));
    expect(await page.getByTestId("engine-name").textContent()).toMatch(/^A-2/);

    await page.locator("#charts-h").scrollIntoViewIfNeeded();
    const chamber = page.getByTestId("chart-chamber-1");
    await chamber.locator("svg.recharts-surface").waitFor();
    const baseline = chamber.locator(".rl-baseline path.recharts-curve");
    // A level baseline is a flat path: present and drawn, though it has no height to be "visible".
    await baseline.waitFor({ state: "attached" });
    expect((await baseline.getAttribute("d"))?.length ?? 0).toBeGreaterThan(10);
    expect(await chamber.locator(".rl-reading path.recharts-curve").count()).toBe(1);
    expect(await chamber.locator(".rl-band path").count()).toBeGreaterThan(0);
    // DEMO.md: A-2's carbon took one chamber below the watch band before its early top end.
    expect(await page.locator('[data-testid^="chart-chamber-"] circle[data-outside="true"]').count()).toBeGreaterThan(0);

    const pdf = await page.request.get(`${BASE_URL}/motors/${a2Id}/sheet.pdf`);
    expect(pdf.status()).toBe(200);
    expect(pdf.headers()["content-type"]).toBe("application/pdf");
    const bytes = await pdf.body();
    expect(bytes.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(bytes.length).toBeGreaterThan(5000);

    const [download] = await Promise.all([page.waitForEvent("download"), page.getByTestId("sheet-pdf-link").click()]);
    expect(download.suggestedFilename()).toMatch(/^build-sheet-A-2-\d{4}-\d{2}-\d{2}\.pdf$/);
    const saved = await download.path();
    expect(readFileSync(saved!).subarray(0, 4).toString("latin1")).toBe("%PDF");

    // Another organisation's engine is not there at all.
    const elsewhere = await engineIdOf("larchwind-trail", "B-2");
    const other = await page.goto(`${BASE_URL}/motors/${elsewhere}`);
    expect(other?.status()).toBe(404);
    expect((await page.request.get(`${BASE_URL}/motors/${elsewhere}/sheet.pdf`)).status()).toBe(404);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("imports usage from CSV with a preview of every row, and a second import writes nothing", async () => {
    const page = await browser.newPage(DESK);
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await signInAs(page, BASE_URL, DEMO.mechanic);
    await page.goto(`${BASE_URL}/motors/import`);
    await hydrated(page);
    const csv = [
      "Motor,Day,Hours,Session,Venue",
      `${freshName},2026-11-20,0.8,Practice,E2E Ridge`,
      `${freshName},2026-11-21,1.2,Final,E2E Ridge`,
      `${freshName},2026-11-21,lots,Final,E2E Ridge`,
      `NO-SUCH-ENGINE,2026-11-21,1.0,Final,E2E Ridge`,
    ].join("\n");
    const file = { name: "season.csv", mimeType: "text/csv", buffer: Buffer.from(csv) };
    await page.getByTestId("import-file").setInputFiles(file);
    await page.getByTestId("import-summary").waitFor();
    // The columns were recognised by their names.
    expect(await page.getByLabel("Engine (name or serial)").inputValue()).toBe("Motor");
    expect(await page.getByLabel("Usage", { exact: true }).inputValue()).toBe("Hours");
    expect(await page.getByTestId("import-to-write").textContent()).toBe("2");
    expect(await page.getByTestId("import-bad").textContent()).toBe("2");
    const bad = await page.getByTestId("import-errors").textContent();
    expect(bad).toMatch(/Not a number/);
    expect(bad).toMatch(/No engine with this name or serial/);
    await shoot(page, "import-preview-1280");
    // Bad rows block the write until they are left out on purpose.
    expect(await page.getByTestId("import-commit").isDisabled()).toBe(true);
    await page.getByTestId("import-skip-bad").check();
    await page.getByTestId("import-commit").click();
    await page.getByTestId("import-result").waitFor();
    expect(await page.getByTestId("import-result").textContent()).toMatch(/Written: 2 sessions, 2 h/);
    const imported = await testDb()("usage_entries").where({ engine_id: freshEngineId, source: "import" });
    expect(imported.map((u) => Number(u.amount)).sort()).toEqual([0.8, 1.2]);

    // The same file again: both rows are recognised and nothing is written twice.
    await page.getByTestId("import-file").setInputFiles(file);
    await page.getByTestId("import-summary").waitFor();
    expect(await page.getByTestId("import-duplicates").textContent()).toBe("2");
    expect(await page.getByTestId("import-to-write").textContent()).toBe("0");
    expect(await page.getByTestId("import-commit").textContent()).toBe("Nothing new to write");
    expect(await testDb()("usage_entries").where({ engine_id: freshEngineId, source: "import" })).toHaveLength(2);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("moves a part to the shelf and lists the chassis", async () => {
    const serial = `E2E-P-${uniqueSuffix()}`.slice(0, 40);
    const partId = await createPart(testDb(), kestrelId, { serial, kind: "piston", engineId: freshEngineId, cylinderNo: 1, installedOn: "2026-11-01", usageLimit: 8 });
    const page = await browser.newPage(PHONE);
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await signInAs(page, BASE_URL, DEMO.mechanic);
    await page.goto(`${BASE_URL}/motors/parts?engineId=${freshEngineId}`);
    await hydrated(page);
    const row = page.locator(`[data-serial="${serial}"]`);
    await row.waitFor();
    expect(await row.getByTestId("part-where").textContent()).toMatch(new RegExp(`in ${freshName}, cylinder 1`));
    await row.getByRole("button", { name: "Move" }).click();
    await row.getByLabel("Move to").selectOption({ label: "the shelf" });
    await row.getByRole("button", { name: "Move", exact: true }).last().click();
    await page.getByTestId("parts-notice").filter({ hasText: "on the shelf" }).waitFor();
    const part = await testDb()("parts").where({ id: partId }).first();
    expect(part.engine_id).toBeNull();
    await expectNoSideways(page);

    await page.goto(`${BASE_URL}/motors/chassis`);
    expect(await page.getByTestId("chassis-row").count()).toBeGreaterThanOrEqual(6);
    expect(await page.locator('[data-chassis="114"]').textContent()).toMatch(/A-2/);
    await expectNoSideways(page);
    expect(errors).toEqual([]);
    await page.close();
  });

  it.runIf(Boolean(SHOTS))("writes screenshots of the roster, an engine file, the reading form and the build sheet", async () => {
    // Screenshots in metric, the units most shops read burettes in.
    await (await signedIn(DEMO.chief)).patch("/api/v1/me/preferences", { unitSystem: "metric", unitChoices: null });
    for (const [size, opts] of [["1280", DESK], ["390", PHONE]] as const) {
      const page = await browser.newPage(opts);
      await signInAs(page, BASE_URL, DEMO.chief);
      await page.goto(`${BASE_URL}/motors`);
      await page.getByTestId("roster").waitFor();
      await shoot(page, `roster-${size}`);
      await page.goto(`${BASE_URL}/motors/${a2Id}`);
      for (const id of ["#charts-h", "#timeline-h", "#thresholds-h"]) await page.locator(id).scrollIntoViewIfNeeded();
      await page.getByTestId("chart-chamber-1").locator("svg.recharts-surface").waitFor();
      await page.getByTestId("engine-timeline").waitFor();
      await page.locator("#usage-h").scrollIntoViewIfNeeded();
      await page.getByTestId("recent-usage").waitFor();
      await page.locator("#thresholds-h").click();
      await page.getByTestId("thresholds-form").waitFor();
      await shoot(page, `engine-${size}`);
      await page.goto(`${BASE_URL}/motors/${a2Id}/readings/new`);
      await hydrated(page);
      await page.getByRole("button", { name: "All metric" }).click();
      await page.getByTestId("unit-status").filter({ hasText: "Saved" }).waitFor();
      await page.getByTestId("cylinder-1").getByLabel("Reading 1", { exact: true }).fill("23.2");
      await page.getByTestId("cylinder-1").getByLabel("Reading 2", { exact: true }).fill("23.3");
      await page.getByTestId("cylinder-1").getByLabel("Squish, side A").fill("1.17");
      await page.getByTestId("cylinder-1").getByLabel("Squish, side B").fill("1.18");
      await page.getByTestId("cylinder-2").getByLabel("Reading 1", { exact: true }).fill("23.5");
      await shoot(page, `reading-form-${size}`);
      if (size === "390") await shoot(page, "reading-form-390-screen", false);
      await page.close();
      const sheet = await browser.newPage(opts);
      await signInAs(sheet, BASE_URL, DEMO.chief);
      await sheet.goto(`${BASE_URL}/motors/${a2Id}/sheet`);
      await shoot(sheet, `sheet-${size}`);
      if (size === "1280") {
        await sheet.emulateMedia({ media: "print" });
        await shoot(sheet, "sheet-print");
        const res = await sheet.request.get(`${BASE_URL}/motors/${a2Id}/sheet.pdf`);
        writeFileSync(`${SHOTS}sheet.pdf`, await res.body());
      }
      await sheet.close();
    }
    for (const [size, opts] of [["1280", DESK], ["390", PHONE]] as const) {
      const page = await browser.newPage(opts);
      await signInAs(page, BASE_URL, DEMO.manager);
      for (const name of ["usage", "import", "chassis", "parts"]) {
        await page.goto(`${BASE_URL}/motors/${name}`);
        await hydrated(page);
        if (name === "usage") await page.getByTestId("recent-usage").waitFor();
        if (name === "parts") await page.getByTestId("part-row").first().waitFor();
        await shoot(page, `${name}-${size}`);
      }
      await page.close();
    }
    expect(existsSync(`${SHOTS}sheet.pdf`) && existsSync(`${SHOTS}engine-390.png`)).toBe(true);
  });
});
