import fs from "node:fs";
import path from "node:path";
import { chromium, type Browser, type Page } from "playwright-core";

export const screensDir = path.resolve(
  import.meta.dirname,
  "../output/screens",
);

/** Debian's Chromium, headless, with the flags this closed network needs. */
export async function launchBrowser(): Promise<Browser> {
  fs.mkdirSync(screensDir, { recursive: true });
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--disable-quic",
      "--no-first-run",
    ],
  });
}

export const desktop = { width: 1280, height: 860 };
export const phone = { width: 375, height: 740 };

/** Saves a full-page screenshot under tests/output/screens (git-ignored) for a person to look at. */
export async function shot(page: Page, name: string): Promise<void> {
  await page.screenshot({
    path: path.join(screensDir, `${name}.png`),
    fullPage: true,
  });
}

/** Collects console errors and CSP violations so a test can assert there were none. */
export function watchConsole(page: Page): string[] {
  const problems: string[] = [];
  page.on("console", (m) => {
    if (m.type() === "error") problems.push(m.text());
  });
  page.on("pageerror", (e) => problems.push(e.message));
  return problems;
}

/** Waits until the locator is visible (fails the test after the timeout). */
export async function visible(
  locator: import("playwright-core").Locator,
  timeout = 10_000,
): Promise<void> {
  await locator.first().waitFor({ state: "visible", timeout });
}

/** How many elements match, once the page has settled. */
export async function countOf(
  locator: import("playwright-core").Locator,
): Promise<number> {
  await locator.page().waitForLoadState("networkidle");
  return locator.count();
}
