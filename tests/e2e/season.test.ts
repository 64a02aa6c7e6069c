import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launchBrowser, signInAs } from "../support/browser.ts";
import { BASE_URL, DEMO, signedIn } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { createSeasonTeam, SEASON_PASSWORD, shiftDay, todayUtc, type SeasonTeam } from "../factories/season.ts";

// The season calendar in Chromium: the demo season on screen, and a job dragged to another day,
// accepted by the server, or refused with the planner's reason when the day is closed.
// With RINGLAND_SCREENSHOTS=/some/prefix- it also writes screenshots for a person to look at.

const SHOTS = process.env.RINGLAND_SCREENSHOTS;
const today = todayUtc();
let browser: Browser;
let team: SeasonTeam;

beforeAll(async () => {
  browser = await launchBrowser();
  await clearSignInAttempts();
  // A team of its own, so dragging never changes the demo plan: E3 (0.5 h left) gets a top end on
  // day 8, before the event on days 10–11 (tests/integration/season-plan.test.ts works it out).
  team = await createSeasonTeam(testDb());
  for (const [name, from, to, chassis] of [["Spring sprint", 1, 1, [team.chassis.c7]], ["Ice oval", 10, 11, [team.chassis.c7, team.chassis.c11]], ["Lakeside", 20, 21, [team.chassis.c7, team.chassis.c11]]] as const) {
    const [eventId] = await testDb()("events").insert({ organisation_id: team.orgId, name, starts_on: shiftDay(today, from), ends_on: shiftDay(today, to), elevation_m: 500, kind: "race" });
    for (const chassisId of chassis) await testDb()("event_entries").insert({ event_id: eventId, chassis_id: chassisId, expected_usage: 1.5 });
  }
  const api = await signedIn(team.emails.manager, SEASON_PASSWORD);
  expect((await api.post("/api/v1/plan", { accept: true })).status).toBe(200);
});
afterAll(async () => {
  await browser?.close();
});
beforeEach(async () => {
  await clearSignInAttempts();
});

async function openSeason(page: Page): Promise<void> {
  await page.goto(`${BASE_URL}/season`);
  await page.getByTestId("season-calendar").waitFor();
}

async function jobRow(): Promise<{ id: number; starts_on: string; pinned: number }> {
  return testDb()("jobs").where({ organisation_id: team.orgId, engine_id: team.engines.e3, state: "planned" }).first();
}

/** Shows a month holding both days (the job's and the target's), moving forward at most twice. */
async function showDays(page: Page, days: string[]): Promise<boolean> {
  for (let i = 0; i < 3; i++) {
    const visible = await Promise.all(days.map((d) => page.locator(`td.fc-daygrid-day[data-date="${d}"]`).count()));
    if (visible.every((n) => n > 0)) return true;
    await page.getByRole("button", { name: "Next month" }).click();
  }
  return false;
}

async function dragJob(page: Page, label: string, toDay: string): Promise<void> {
  const chip = page.locator(".fc-event", { hasText: label }).first();
  const from = await chip.boundingBox();
  const to = await page.locator(`td.fc-daygrid-day[data-date="${toDay}"]`).boundingBox();
  if (!from || !to) throw new Error("the job or the day is not on screen");
  await page.mouse.move(from.x + 12, from.y + from.height / 2);
  await page.mouse.down();
  await page.mouse.move(from.x + 30, from.y + from.height / 2, { steps: 4 });
  await page.mouse.move(to.x + to.width / 2, to.y + to.height * 0.6, { steps: 15 });
  await page.mouse.up();
}

describe("the season calendar", () => {
  it("shows the demo season: its events on the calendar and as a list, with their engines", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, BASE_URL, DEMO.manager);
    await openSeason(page);
    expect(await page.locator(".fc-daygrid").count()).toBe(1);
    expect(await page.getByTestId("plan-notes").textContent()).toMatch(/Plan accepted/);
    await page.getByRole("button", { name: "List", exact: true }).click();
    await page.getByLabel("Show past events").check();
    const list = (await page.getByTestId("season-list").textContent()) ?? "";
    for (const name of ["Pinecrest Flats", "Red Tamarack", "Birchmoor Final", "Copperjack Basin hillclimb", "Cold Fork Basin hillclimb"]) expect(list).toContain(name);
    // The demo plan worked out by hand: A-1's bottom end before Birchmoor Fairgrounds.
    expect(list).toMatch(/A-1 bottom end/);
    await page.getByRole("button", { name: /Birchmoor Final/ }).click();
    const panel = page.getByTestId("event-panel");
    await panel.waitFor();
    expect(await panel.getByTestId("event-entry").count()).toBe(2);
    expect((await panel.textContent()) ?? "").toMatch(/Fuel check at 396 m/);
    expect((await page.getByTestId("fuel-cautions").textContent()) ?? "").toMatch(/Detonation/);
    if (SHOTS) await page.screenshot({ path: `${SHOTS}season-event-1280.png`, fullPage: true });
    await context.close();
  });

  it("reads as a list by date at 390 px", async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await signInAs(page, BASE_URL, DEMO.mechanic);
    await openSeason(page);
    await page.getByTestId("season-list").waitFor();
    const box = await page.getByTestId("season-list").boundingBox();
    expect(box && box.x + box.width).toBeLessThanOrEqual(390);
    expect(await page.getByTestId("replan").count()).toBe(0);
    if (SHOTS) await page.screenshot({ path: `${SHOTS}season-390.png`, fullPage: true });
    await context.close();
  });

  it("moves a job dragged to an open day, and refuses a drag onto a closed day with the reason", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, BASE_URL, team.emails.manager, SEASON_PASSWORD);
    await openSeason(page);
    const before = await jobRow();
    expect(before.starts_on).toBe(shiftDay(today, 8));
    const target = shiftDay(today, 7);
    expect(await showDays(page, [before.starts_on, target])).toBe(true);
    await dragJob(page, "E3 top end", target);
    await page.getByTestId("season-status").filter({ hasText: "Moved" }).waitFor();
    const moved = await jobRow();
    expect(moved.id).toBe(before.id);
    expect(moved.starts_on).toBe(target);
    expect(Boolean(moved.pinned)).toBe(true);

    const closed = shiftDay(today, 6);
    await testDb()("shop_closed_days").insert({ organisation_id: team.orgId, day: closed, reason: "Stock-take" });
    await openSeason(page);
    expect(await showDays(page, [target, closed])).toBe(true);
    await dragJob(page, "E3 top end", closed);
    const refusal = page.getByTestId("season-status").filter({ hasText: "Not moved" });
    await refusal.waitFor();
    expect(await refusal.textContent()).toMatch(/the shop is closed that day/);
    expect((await jobRow()).starts_on).toBe(target);
    // The chip went back to its day.
    expect(await page.locator(`td.fc-daygrid-day[data-date="${target}"] .fc-event`, { hasText: "E3 top end" }).count()).toBe(1);
    if (SHOTS) await page.screenshot({ path: `${SHOTS}season-drag-1280.png`, fullPage: true });
    await context.close();
  });
});
