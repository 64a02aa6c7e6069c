import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser, signInAs } from "../support/browser.ts";
import { BASE_URL } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { addMember, createOrganisation, createUser, uniqueSuffix } from "../factories/people.ts";
import { createEngine, createReadingSet } from "../factories/motors.ts";
import { runSignalCheck } from "../../src/server/signals/check.ts";
import { loadEngineSignalInputs } from "../../src/server/signals/engine-inputs.ts";

const PASSWORD = "a-long-test-password";
let browser: Browser;
let chiefEmail = "";
let orgId = 0;

beforeAll(async () => {
  await clearSignInAttempts();
  browser = await launchBrowser();
  const s = uniqueSuffix();
  orgId = await createOrganisation(testDb(), { name: `Inbox ${s}`, slug: `inbox-${s}` });
  chiefEmail = `chief-${s}@test.example`;
  const chief = await createUser(testDb(), { email: chiefEmail, name: "Pat Chief", password: PASSWORD });
  await addMember(testDb(), orgId, chief, "crew_chief");
  const engineId = await createEngine(testDb(), orgId, { name: `Twin-${s}`, status: "running" });
  const cyl = (cc: number) => [
    { cylinderNo: 1, chamberReadingsCc: [cc, cc], squishAMm: 1.2, squishBMm: 1.21 },
    { cylinderNo: 2, chamberReadingsCc: [23.6, 23.6], squishAMm: 1.21, squishBMm: 1.2 },
  ];
  await createReadingSet(testDb(), orgId, { engineId, takenOn: "2026-11-20", elevationM: 366, isBaseline: true, setKind: "build", cylinders: cyl(23.6) });
  await createReadingSet(testDb(), orgId, { engineId, takenOn: "2026-11-30", elevationM: 366, cylinders: cyl(22.9) });
  await runSignalCheck(testDb(), orgId, new Date("2026-12-01T12:00:00Z"), loadEngineSignalInputs);
});
afterAll(async () => {
  await browser?.close();
});

describe("the Signals inbox in a browser", () => {
  it("acknowledges a signal, refuses to resolve it without a note, then resolves it, at 390 px", async () => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } });
    await signInAs(page, BASE_URL, chiefEmail, PASSWORD);
    await page.goto(`${BASE_URL}/signals?severity=act`);
    const first = page.getByTestId("signal-list").locator("li").first();
    const id = await first.getAttribute("data-signal-id");
    await first.getByRole("button", { name: "Acknowledge" }).click();
    await page.waitForLoadState("load");
    const acked = page.locator(`#signal-${id}`);
    expect(await acked.textContent()).toContain("acknowledged by Pat Chief");

    await acked.getByRole("button", { name: "Resolve" }).click();
    await page.waitForLoadState("load");
    expect(await page.getByRole("alert").first().textContent()).toContain("note");
    expect((await testDb()("signals").where({ id }).first()).state).toBe("acknowledged");

    await page.locator(`#signal-${id}`).getByLabel("What was done or found").fill("Decarbonised the crown and the squish band.");
    await page.locator(`#signal-${id}`).getByRole("button", { name: "Resolve" }).click();
    await page.waitForLoadState("load");
    expect(await page.locator(`#signal-${id}`).count()).toBe(0); // resolved ones leave the open list
    const row = await testDb()("signals").where({ id }).first();
    expect(row.state).toBe("resolved");
    expect(row.resolution_note).toBe("Decarbonised the crown and the squish band.");

    await page.goto(`${BASE_URL}/signals?state=resolved`);
    expect(await page.locator(`#signal-${id}`).textContent()).toContain("resolved by Pat Chief");
    await page.close();
  });
});
