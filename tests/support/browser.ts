import { chromium, type Browser, type Page } from "playwright-core";
import { existsSync } from "node:fs";

/** Debian's Chromium, headless, with the flags this closed network needs. */
export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

export async function launchBrowser(): Promise<Browser> {
  if (!existsSync(CHROMIUM_PATH)) throw new Error(`Chromium not found at ${CHROMIUM_PATH}; npm test installs Debian's chromium`);
  return chromium.launch({
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--disable-dev-shm-usage",
    ],
  });
}

export const DEMO_PASSWORD = "ringland-demo";

export async function signInAs(page: Page, baseUrl: string, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
}
