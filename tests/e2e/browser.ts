import fs from "node:fs";
import path from "node:path";
import { chromium, type Browser, type Page } from "playwright-core";
import { DEMO_PASSWORD } from "../factories/demo-scenario";

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

/** Signs in through the real form in a fresh browser context; returns the page and its console problems. */
export async function signInPage(
  browser: Browser,
  baseUrl: string,
  email: string,
  opts: {
    viewport?: { width: number; height: number };
    acceptDownloads?: boolean;
    /** Start at "/" and let the signed-out guard send us to the form (as a person would arrive). */
    viaGuard?: boolean;
  } = {},
): Promise<{ page: Page; problems: string[] }> {
  const context = await browser.newContext({
    viewport: opts.viewport ?? desktop,
    acceptDownloads: opts.acceptDownloads ?? false,
  });
  const page = await context.newPage();
  const problems = watchConsole(page);
  if (opts.viaGuard) {
    await page.goto(`${baseUrl}/`);
    await page.waitForURL(/\/sign-in/);
  } else {
    await page.goto(`${baseUrl}/sign-in`);
  }
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((u) => !u.pathname.startsWith("/sign-in"));
  return { page, problems };
}

/** GET an API path with the page's own session (what the screens read). */
export async function apiGet<T>(page: Page, p: string): Promise<T> {
  return page.evaluate(async (url) => {
    const r = await fetch(url, { headers: { Accept: "application/json" } });
    return r.json();
  }, p) as Promise<T>;
}

const axeSource = () =>
  fs.readFileSync(
    path.resolve(import.meta.dirname, "../../node_modules/axe-core/axe.min.js"),
    "utf8",
  );

/**
 * axe-core's serious and critical findings on the whole page. The production CSP (script-src
 * 'self') refuses an injected <script> (addScriptTag), so axe is evaluated through the DevTools
 * protocol instead, with the page's CSP left on.
 */
export async function axeSeriousOrWorse(page: Page): Promise<string[]> {
  await page.evaluate(axeSource());
  const result = await page.evaluate(async () => {
    const axe = (
      window as unknown as {
        axe: {
          run: () => Promise<{
            violations: {
              id: string;
              impact: string | null;
              help: string;
              nodes: { target: string[] }[];
            }[];
          }>;
        };
      }
    ).axe;
    return axe.run();
  });
  return result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map(
      (v) =>
        `${v.id} (${v.impact}): ${v.help} — ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`,
    );
}

const WEEKDAY = ["Sun", "Mon", "Tue", "Wed", "Thu", "Fri", "Sat"];
const MONTH = "Jan Feb Mar Apr May Jun Jul Aug Sep Oct Nov Dec".split(" ");
/**
 * "Thu 5 Mar" as the screens write a date (brief, "Look and feel": the weekday with the date; the
 * year only outside this year), worked out here rather than by the app's own formatter.
 */
export function dayText(local: string): string {
  const d = new Date(`${local.slice(0, 10)}T12:00:00Z`);
  const year =
    d.getUTCFullYear() !== new Date().getFullYear()
      ? ` ${d.getUTCFullYear()}`
      : "";
  return `${WEEKDAY[d.getUTCDay()]} ${d.getUTCDate()} ${MONTH[d.getUTCMonth()]}${year}`;
}

/** The half of the day a local start falls in, as the booking screens say it. */
export const half = (local: string) =>
  local.slice(11, 16) >= "12:00" ? "afternoon" : "morning";
