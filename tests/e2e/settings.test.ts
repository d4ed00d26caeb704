// Issue 14: the set-up after sign-up (/setup) and the owner's workshop settings (/settings), with
// the knock-on of a change to the working days shown before it is saved; the empty home of a
// workshop with nothing in it yet. The demo owner, at desktop and phone width, with axe.
// Chromium against the built client (production CSP).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { startTestApp, type TestApp } from "../setup/test-app";
import { DEMO_WORKSHOP_NAME, demoAccounts } from "../factories/demo-scenario";
import { buildMember, buildUser, buildWorkshop } from "../factories/builders";
import { addDefaultStarters } from "../../server/modules/starters/starters.service";
import { Workshop } from "../../server/modules/workshops/workshops.entity";
import type { WorkshopResponse } from "../../shared/schemas";
import {
  apiGet,
  axeSeriousOrWorse,
  countOf,
  desktop,
  launchBrowser,
  phone,
  shot,
  signInPage,
  visible,
} from "./browser";

let t: TestApp;
let browser: Browser;
let workshop: Workshop;

beforeAll(async () => {
  t = await startTestApp({ demo: true, listen: true });
  browser = await launchBrowser();
  workshop = await t.db.ds.manager.findOneByOrFail(Workshop, {
    name: DEMO_WORKSHOP_NAME,
  });
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await t?.close();
});

const nav = (page: Page) => page.getByRole("navigation", { name: "Main" });
const settingsOf = (page: Page) =>
  apiGet<WorkshopResponse>(page, `/api/workshops/${workshop.id}`);
const clean = async (page: Page, name: string) => {
  await shot(page, name);
  expect(await axeSeriousOrWorse(page)).toEqual([]);
  // Nothing wider than the screen (375 px on a phone).
  const overflow = await page.evaluate(
    () => document.documentElement.scrollWidth - window.innerWidth,
  );
  expect(overflow).toBeLessThanOrEqual(0);
};

for (const [width, viewport] of [
  ["desktop", desktop],
  ["phone", phone],
] as const) {
  describe(`the owner on ${width}`, () => {
    it("goes through the set-up, skipping a step, and finishes it", async () => {
      // As a workshop just signed up: the set-up not begun.
      await t.db.ds.manager.update(
        Workshop,
        { id: workshop.id },
        { setupCompletedAt: null, setupStep: null },
      );
      const { page, problems } = await signInPage(
        browser,
        t.url!,
        demoAccounts.owner.email,
        { viewport },
      );
      const banner = page
        .getByRole("status")
        .filter({ hasText: "Your workshop is not set up yet." });
      await banner.waitFor();
      await clean(page, `settings-${width}-01-home-finish-setting-up`);
      await banner.getByRole("link", { name: "Finish setting up" }).click();
      await page.waitForURL(/\/setup$/);
      await visible(
        page.getByRole("heading", {
          name: "Step 1 of 3: Nation and time zone",
        }),
      );
      await visible(page.getByLabel("Nation"));
      await clean(page, `settings-${width}-02-setup-nation`);
      await page.getByRole("button", { name: "Skip this step" }).click();

      await visible(
        page.getByRole("heading", {
          name: "Step 2 of 3: Working days and hours",
        }),
      );
      // Progress is remembered on the workshop: a reload comes back to this step.
      expect((await settingsOf(page)).setupStep).toBe("days");
      await page.reload();
      await visible(
        page.getByRole("heading", {
          name: "Step 2 of 3: Working days and hours",
        }),
      );
      await clean(page, `settings-${width}-03-setup-days`);
      await page.getByRole("button", { name: "Save and continue" }).click();

      await visible(
        page.getByRole("heading", {
          name: "Step 3 of 3: Arrival times and reminders",
        }),
      );
      await page.getByRole("checkbox", { name: "Between set times" }).uncheck();
      await page
        .getByLabel("Reminder to the trade")
        .selectOption({ label: "2 working days before" });
      await clean(page, `settings-${width}-04-setup-arrivals`);
      await page.getByRole("button", { name: "Save and continue" }).click();

      await visible(page.getByRole("heading", { name: "Next steps" }));
      for (const name of ["Add your trades", "Start a job"])
        await visible(page.getByRole("link", { name }));
      await visible(page.getByRole("button", { name: "Add a customer" }));
      await visible(page.getByText(/Your starters: alcove cabinets/));
      const saved = await settingsOf(page);
      expect(saved.arrivalWindows).toEqual(["morning", "afternoon", "all-day"]);
      expect(saved.reminderDays).toBe(2);
      await clean(page, `settings-${width}-05-setup-next-steps`);
      await page.getByRole("button", { name: "Finish setting up" }).click();
      await page.waitForURL((u) => u.pathname === "/");
      await page.getByRole("heading", { level: 1 }).waitFor();
      expect(
        await countOf(page.getByText("Your workshop is not set up yet.")),
      ).toBe(0);
      expect((await settingsOf(page)).setupCompletedAt).not.toBeNull();
      expect(problems).toEqual([]);
      await page.context().close();
    });

    it("changes the working days in Settings: the knock-on first, then saved on confirm", async () => {
      const { page, problems } = await signInPage(
        browser,
        t.url!,
        demoAccounts.owner.email,
        { viewport },
      );
      const before = await settingsOf(page);
      if (width === "phone") {
        // The phone's nav may be a menu; the link is there either way.
        await page.goto(`${t.url}/settings`);
      } else {
        await nav(page).getByRole("link", { name: "Settings" }).click();
      }
      await visible(
        page.getByRole("heading", { name: "Workshop settings", level: 1 }),
      );
      await visible(page.getByRole("heading", { name: "Starters" }));
      await visible(page.getByText("Fitted wardrobe").first());
      await visible(page.getByText(demoAccounts.fitter.name));
      await clean(page, `settings-${width}-06-settings`);

      // Desktop takes Monday off the workshop's days (the demo's "Hang doors" is on a Monday);
      // the phone gives it back.
      const monday = page
        .getByRole("group", { name: "Days the workshop works" })
        .getByRole("checkbox", { name: "Mon" });
      const removing = before.workingWeekdays.includes(1);
      await (removing ? monday.uncheck() : monday.check());
      await page.getByRole("button", { name: "Save settings" }).click();

      const knockOn = page.getByRole("region", {
        name: /This change re-plans \d+ open jobs?/,
      });
      await knockOn.waitFor();
      await visible(knockOn.getByText(/Finish:/).first());
      await visible(
        knockOn
          .getByText(removing ? /working days? later/ : /working days? sooner/)
          .first(),
      );
      // Nothing is saved until the owner confirms.
      expect((await settingsOf(page)).workingWeekdays).toEqual(
        before.workingWeekdays,
      );
      await clean(page, `settings-${width}-07-knock-on`);
      await page
        .getByRole("button", { name: "Save and re-plan these jobs" })
        .click();
      await page
        .getByRole("status")
        .filter({ hasText: /Settings saved\. \d+ jobs? re-planned/ })
        .waitFor();
      expect((await settingsOf(page)).workingWeekdays).toEqual(
        removing ? [2, 3, 4, 5] : [1, 2, 3, 4, 5],
      );
      await clean(page, `settings-${width}-08-saved`);
      expect(problems).toEqual([]);
      await page.context().close();
    });
  });
}

describe("who sees the settings", () => {
  it("a fitter has no Settings link and gets the owner-only answer", async () => {
    const { page, problems } = await signInPage(
      browser,
      t.url!,
      demoAccounts.fitter.email,
    );
    await page.getByRole("heading", { level: 1 }).waitFor();
    expect(
      await countOf(nav(page).getByRole("link", { name: "Settings" })),
    ).toBe(0);
    await page.goto(`${t.url}/settings`);
    await visible(page.getByText("This page is for the workshop's owner"));
    expect(problems).toEqual([]);
    await page.context().close();
  });
});

describe("an empty workshop's home", () => {
  it("says what to do next, in the trade's words, with the buttons", async () => {
    const m = t.db.ds.manager;
    const w = await buildWorkshop(m, { name: "Newly Made Joinery" });
    await addDefaultStarters(m, w.id);
    const u = await buildUser(m, { email: "first-owner@example.test" });
    await buildMember(m, w, u, "owner");
    for (const viewport of [desktop, phone]) {
      const { page, problems } = await signInPage(browser, t.url!, u.email, {
        viewport,
      });
      await visible(page.getByText("No jobs yet"));
      await visible(
        page.getByText(
          /Add the trades you work with, then start a job from a starter — alcove cabinets/,
        ),
      );
      await visible(page.getByRole("link", { name: "Add your trades" }));
      const start = page.getByRole("button", {
        name: "Start a job from a starter",
      });
      await visible(start);
      await clean(
        page,
        `settings-empty-home-${viewport === phone ? "phone" : "desktop"}`,
      );
      await start.click();
      await visible(page.getByRole("heading", { name: "New job" }));
      expect(problems).toEqual([]);
      await page.context().close();
    }
  });
});
