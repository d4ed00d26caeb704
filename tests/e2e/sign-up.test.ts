// Issue 14: a new workshop from the sign-in page, the banner while the address is unconfirmed
// (and the refusal where an e-mail would have gone), the e-mailed link, and the banner gone —
// at desktop and phone width, with axe on each screen.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { startTestApp, type TestApp } from "../setup/test-app";
import {
  apiGet,
  axeSeriousOrWorse,
  countOf,
  desktop,
  launchBrowser,
  phone,
  shot,
  visible,
  watchConsole,
} from "./browser";

let t: TestApp;
let browser: Browser;

beforeAll(async () => {
  t = await startTestApp({ listen: true });
  browser = await launchBrowser();
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await t?.close();
});

const checkAxe = async (page: Page, what: string) =>
  expect(await axeSeriousOrWorse(page), what).toEqual([]);

describe.each([
  ["desktop", desktop],
  ["phone", phone],
])("sign-up in the browser (%s)", (name, viewport) => {
  it("creates a workshop from the sign-in page, sees the banner, confirms the address from the e-mail, and the banner goes", async () => {
    const email = `ada.${name}@fettlegrain.example.test`;
    const context = await browser.newContext({ viewport });
    try {
      const page = await context.newPage();
      const problems = watchConsole(page);
      await page.goto(`${t.url}/sign-in`);
      await page.getByRole("link", { name: "Create your workshop" }).click();
      await page.waitForURL(/\/sign-up$/);
      await visible(
        page.getByRole("heading", { name: "Create your workshop" }),
      );
      // A password from a breach list is refused with the server's words, beside the field.
      await page.getByLabel("Workshop name").fill("Fettle & Grain Joinery");
      await page.getByLabel("Your name").fill("Ada Fettle");
      await page.getByLabel("E-mail").fill(email);
      await page.getByLabel("Password").fill("password123");
      await page.getByRole("button", { name: "Create your workshop" }).click();
      await visible(
        page.getByText(
          "That password is on a list of passwords used in breaches — choose another",
        ),
      );
      await checkAxe(page, "sign-up form with a refused password");
      await shot(page, `sign-up-refused-${name}`);

      await page.getByLabel("Password").fill("sawdust-and-shellac");
      await page.getByRole("button", { name: "Create your workshop" }).click();
      // The set-up screen is another part of issue 14; until it is merged the path is unknown.
      await page.waitForURL(/\/setup$/);
      const me = await apiGet<{
        user: { email: string; emailVerified: boolean } | null;
      }>(page, "/api/auth/session");
      expect(me.user).toMatchObject({ email, emailVerified: false });

      await page.goto(`${t.url}/`);
      const banner = page.getByRole("region", {
        name: "Confirm your e-mail address",
      });
      await visible(banner);
      await visible(banner.getByText(email));
      await checkAxe(page, "home with the banner");
      await shot(page, `sign-up-banner-${name}`);

      // Inviting someone would e-mail them: refused, and the words say why, where it was tried.
      await page.goto(`${t.url}/members`);
      const invite = page.getByRole("form", { name: "Invite someone" });
      await invite.getByLabel("Name").fill("Finn Castle");
      await invite.getByLabel("E-mail").fill(`finn.${name}@example.test`);
      await invite.getByRole("button", { name: /invit/i }).click();
      await visible(
        invite.getByText(
          `Confirm your e-mail address first (we sent a link to ${email}).`,
          { exact: false },
        ),
      );
      await checkAxe(page, "members with the refusal");
      await shot(page, `sign-up-invite-refused-${name}`);
      expect(
        t.mail.messages().filter((m) => m.to.includes(`finn.${name}@`)),
      ).toEqual([]);

      // "Send it again" e-mails a fresh link; the newest one is used.
      const before = new Set(t.mail.messages());
      await banner.getByRole("button", { name: "Send it again" }).click();
      await visible(banner.getByText(`Sent a new link to ${email}.`));
      const mail = await t.mail.waitFor(
        (m) =>
          !before.has(m) &&
          m.to.includes(email) &&
          m.subject === "Confirm your e-mail address for Sitecue",
      );
      const link = mail.links.find((l) => l.includes("/verify/"))!;
      expect(link.startsWith(`${t.url}/verify/`)).toBe(true);

      await page.goto(link);
      await visible(page.getByText("Your e-mail address is confirmed"));
      await checkAxe(page, "address confirmed");
      await shot(page, `sign-up-verified-${name}`);
      await page.getByRole("link", { name: "Open Sitecue" }).click();
      await page.waitForURL((u) => u.pathname === "/");
      expect(
        await countOf(
          page.getByRole("region", { name: "Confirm your e-mail address" }),
        ),
      ).toBe(0);

      // The same link again says it was used, in its own words.
      await page.goto(link);
      await visible(page.getByText(/This link has already been used/));
      await checkAxe(page, "used link");
      await shot(page, `sign-up-used-link-${name}`);
      // Only the three refusals this walk asks for (the browser logs each refused request).
      expect(problems).toEqual(
        [400, 403, 404].map(
          (status) =>
            `Failed to load resource: the server responded with a status of ${status} (${{ 400: "Bad Request", 403: "Forbidden", 404: "Not Found" }[status]})`,
        ),
      );
    } finally {
      await context.close();
    }
  });
});
