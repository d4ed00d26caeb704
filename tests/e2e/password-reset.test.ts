// The anonymous forms in the browser, now that a visitor gets no stored session until they
// sign in (the CSRF token comes in a signed cookie): asking for a reset link, using it, and an
// older link refused with the server's reason (issue 13, ASVS v4.0.3 2.5.x / 3.3.3).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext } from "playwright-core";
import { startTestApp, type TestApp } from "../setup/test-app";
import { demoAccounts } from "../factories/demo-scenario";
import {
  apiGet,
  launchBrowser,
  phone,
  shot,
  signInPage,
  visible,
  watchConsole,
} from "./browser";

let t: TestApp;
let browser: Browser;

beforeAll(async () => {
  t = await startTestApp({ demo: true, listen: true });
  browser = await launchBrowser();
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await t?.close();
});

const email = demoAccounts.fitter.email;

/** Asks for a reset link through the form, in a fresh phone browser; returns the link. */
async function askForLink(): Promise<string> {
  const before = new Set(t.mail.messages());
  const context = await browser.newContext({ viewport: phone });
  const page = await context.newPage();
  const problems = watchConsole(page);
  await page.goto(`${t.url}/forgot-password`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByRole("button", { name: "Send reset link" }).click();
  await visible(page.getByText(/we've sent a link to set a new password/));
  expect(problems).toEqual([]);
  await context.close();
  const mail = await t.mail.waitFor(
    (m) =>
      !before.has(m) &&
      m.to.includes(email) &&
      m.subject === "Reset your Sitecue password",
  );
  return mail.links.find((l) => l.includes("/reset/"))!;
}

describe("password reset in the browser", () => {
  it("a fresh visitor asks twice, uses the newer link, and the older one says it was replaced", async () => {
    const older = await askForLink();
    const newer = await askForLink();

    // Signed in elsewhere before the reset: that session ends with it.
    const { page: elsewhere } = await signInPage(browser, t.url!, email);
    let context: BrowserContext | null = null;
    try {
      context = await browser.newContext({ viewport: phone });
      const page = await context.newPage();
      const problems = watchConsole(page);
      await page.goto(newer);
      await page.getByLabel("New password").fill("joel-reset-in-browser");
      await page.getByLabel("Confirm password").fill("joel-reset-in-browser");
      await page.getByRole("button", { name: "Save new password" }).click();
      await page.waitForURL((u) => !u.pathname.startsWith("/reset/"));
      const me = await apiGet<{ user: { email: string } | null }>(
        page,
        "/api/auth/session",
      );
      expect(me.user?.email).toBe(email);
      expect(problems).toEqual([]);

      const ended = await apiGet<{ user: unknown }>(
        elsewhere,
        "/api/auth/session",
      );
      expect(ended.user).toBeNull();

      await page.goto(older);
      await visible(page.getByText("This link no longer works"));
      await visible(
        page.getByText(
          /A newer link has been used to set this account's password/,
        ),
      );
      await shot(page, "reset-older-link-phone");
    } finally {
      await context?.close();
      await elsewhere.context().close();
    }
  });
});
