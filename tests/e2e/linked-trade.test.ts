// Issue 14, on a 375 px phone: the demo plasterer works for both demo workshops, so "Your visits"
// and "My calendar" hold visits for each, with its workshop's name; the second workshop's owner,
// booking the plasterer over the first workshop's visit, is told only that they are busy for
// another workshop — nothing of that job, its customer or address. axe-core on every page.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Locator, Page } from "playwright-core";
import { signIn, startTestApp, type TestApp } from "../setup/test-app";
import {
  demoAccounts,
  DEMO_PASSWORD,
  DEMO_WORKSHOP_NAME,
  demoJobTitles,
  weekdaysFrom,
} from "../factories/demo-scenario";
import { demoSecondWorkshop } from "../factories/demo-second-workshop";
import {
  buildMember,
  buildTask,
  buildUser,
  buildWorkshop,
} from "../factories/builders";
import { Job } from "../../server/modules/jobs/jobs.entity";
import { localToday } from "../../server/modules/jobs/jobs.presenter";
import {
  axeSeriousOrWorse,
  dayText,
  launchBrowser,
  phone,
  shot,
  signInPage,
  visible,
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

const d = (n: number) => weekdaysFrom(localToday("Europe/London"), n);
const card = (page: Page, taskName: string): Locator =>
  page
    .getByTestId("visit-card")
    .filter({ has: page.getByRole("heading", { name: taskName }) });
const flat = (s: string) => s.replace(/\s+/g, " ");

describe("one plasterer, two workshops", () => {
  it("the plasterer's 'Your visits' and 'My calendar' list both workshops' visits, each named", async () => {
    const { page, problems } = await signInPage(
      browser,
      t.url!,
      demoAccounts.trade.email,
      { viewport: phone },
    );
    await visible(page.getByRole("heading", { name: "Your visits", level: 1 }));
    const mine = card(page, "Template coving");
    const theirs = card(page, "Skim larder walls");
    await visible(mine);
    await visible(theirs);
    expect(flat(await mine.innerText())).toContain(
      `${DEMO_WORKSHOP_NAME} · ${demoJobTitles.alcoves}`,
    );
    const skim = flat(await theirs.innerText());
    expect(skim).toContain(
      `${demoSecondWorkshop.name} · ${demoSecondWorkshop.jobTitle}`,
    );
    expect(skim).toContain(dayText(d(demoSecondWorkshop.plastererDays.skim)));
    await visible(card(page, "Make good around the island"));
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    await shot(page, "visits-two-workshops-phone");

    // My calendar: on a phone, a day-by-day list two weeks at a time.
    await page.goto(`${t.url}/my-calendar`);
    const entry = (name: string) =>
      page.getByTestId("calendar-list-entry").filter({ hasText: name });
    await visible(entry("Template coving"));
    expect(flat(await entry("Template coving").first().innerText())).toContain(
      DEMO_WORKSHOP_NAME,
    );
    await visible(
      page.getByText(
        `Your visits for ${DEMO_WORKSHOP_NAME} and ${demoSecondWorkshop.name}`,
        { exact: false },
      ),
    );
    // Each "Later →" reads the next two weeks from the server: wait for them before looking.
    for (let i = 0; i < 4 && !(await entry("Skim larder walls").count()); i++) {
      await page.getByRole("button", { name: "Later →" }).click();
      await page.waitForFunction(
        () =>
          ![...document.querySelectorAll('[role="status"]')].some((e) =>
            e.textContent?.includes("Loading these days…"),
          ),
      );
    }
    await visible(entry("Skim larder walls"));
    expect(
      flat(await entry("Skim larder walls").first().innerText()),
    ).toContain(demoSecondWorkshop.name);
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    await shot(page, "my-calendar-two-workshops-phone");
    expect(problems).toEqual([]);
    await page.context().close();
  }, 60_000);

  it("the second workshop's owner, booking over the first's visit, sees only 'busy for another workshop'", async () => {
    const m = t.db.ds.manager;
    const job = await m.findOneByOrFail(Job, {
      title: demoSecondWorkshop.jobTitle,
    });
    // A plasterer task not booked yet, for the owner to book.
    await buildTask(m, job, {
      name: "Patch the pantry ceiling",
      party: "plasterer",
      durationDays: 0.5,
    });
    const { page, problems } = await signInPage(
      browser,
      t.url!,
      demoSecondWorkshop.owner.email,
      { viewport: phone },
    );
    await page.goto(`${t.url}/jobs/${job.id}/programme`);
    const item = page
      .getByRole("list", { name: "Tasks" })
      .getByRole("listitem")
      .filter({
        has: page.getByRole("heading", {
          name: "Patch the pantry ceiling",
          exact: true,
        }),
      });
    await item
      .getByRole("button", {
        name: "Book a plasterer for Patch the pantry ceiling",
      })
      .click();
    const panel = page.getByRole("form", {
      name: "Book a plasterer for Patch the pantry ceiling",
    });
    await visible(panel);
    // The first workshop's template visit: the morning of the next weekday.
    await panel.getByLabel("Start", { exact: true }).fill(d(1));
    await panel.getByRole("radio", { name: "Morning" }).first().check();
    await panel.getByRole("button", { name: "Save as draft" }).click();
    const alert = panel.getByRole("alert").filter({
      hasText: "That start does not work for them",
    });
    await visible(alert);
    const text = flat(await alert.innerText());
    expect(text).toContain(demoSecondWorkshop.tradeBusinessName);
    expect(text).toContain("busy for another workshop");
    for (const word of [
      DEMO_WORKSHOP_NAME,
      "Alcove",
      "Template coving",
      "Larkspur",
      "Rosa",
    ])
      expect(text).not.toContain(word);
    const body = await page.locator("body").innerText();
    for (const word of ["Alcove", "Template coving", "Larkspur"])
      expect(body).not.toContain(word);
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    await shot(page, "booking-busy-elsewhere-phone");
    // The 409 itself is logged by the browser as a failed request; nothing else may be.
    expect(problems.filter((p) => !p.includes("409"))).toEqual([]);
    await page.context().close();
  }, 60_000);

  it("a third workshop's invitation asks the plasterer to sign in and link, and the owner sees the account only as existing", async () => {
    const m = t.db.ds.manager;
    const ws = await buildWorkshop(m, { name: "Pennock Fitted Furniture" });
    const ada = await buildUser(m, {
      email: "ada@pennockfitted.example.test",
      name: "Ada Pennock",
      password: DEMO_PASSWORD,
    });
    await buildMember(m, ws, ada, "owner");
    const owner = await signIn(t, ada.email);
    const record = await owner.agent
      .post(`/api/workshops/${ws.id}/trades`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        kind: "plasterer",
        businessName: "Dev Ashby (plaster)",
        contactName: "Dev Ashby",
        email: demoAccounts.trade.email,
        phone: "07700 900 114",
        workingWeekdays: [1, 2, 3, 4, 5],
        dayStart: "08:00",
        dayEnd: "16:30",
      })
      .expect(201);

    // The owner's trades list says an account exists, and nothing of where else they work.
    const o = await signInPage(browser, t.url!, ada.email, { viewport: phone });
    await o.page.goto(`${t.url}/trades`);
    await visible(
      o.page.getByText("Has a Sitecue account — they will be asked to link it"),
    );
    const list = await o.page.locator("body").innerText();
    for (const word of [
      DEMO_WORKSHOP_NAME,
      demoSecondWorkshop.name,
      "Ashby Plaster & Coving",
    ])
      expect(list).not.toContain(word);
    expect(await axeSeriousOrWorse(o.page)).toEqual([]);
    await shot(o.page, "trades-existing-account-phone");
    expect(o.problems).toEqual([]);
    await o.page.context().close();

    const before = new Set(t.mail.messages());
    await owner.agent
      .post(`/api/workshops/${ws.id}/invitations`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        role: "trade",
        name: "Dev Ashby",
        email: demoAccounts.trade.email,
        tradeId: record.body.id,
      })
      .expect(201);
    const mail = await t.mail.waitFor(
      (x) => !before.has(x) && x.to.includes(demoAccounts.trade.email),
    );
    const link = new URL(mail.links.find((l) => l.includes("/invite/"))!);

    // Signed out, on a phone: who asks, as what, and "Sign in to accept" — no password to choose.
    const context = await browser.newContext({ viewport: phone });
    const page = await context.newPage();
    const problems: string[] = [];
    page.on("pageerror", (e) => problems.push(e.message));
    await page.goto(`${t.url}${link.pathname}`);
    await visible(
      page.getByText(
        "Pennock Fitted Furniture asks you to join their jobs on Sitecue as Dev Ashby (plaster)",
        { exact: false },
      ),
    );
    expect(await page.getByLabel("New password").count()).toBe(0);
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    await shot(page, "invite-existing-account-phone");
    await page.getByRole("link", { name: "Sign in to accept" }).click();
    await page.getByLabel("E-mail").fill(demoAccounts.trade.email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    // Back on the invitation, signed in as that account.
    await page.waitForURL((u) => u.pathname === link.pathname);
    const accept = page.getByRole("button", { name: "Accept and link" });
    await visible(accept);
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    await shot(page, "invite-accept-signed-in-phone");
    await accept.click();
    await visible(page.getByRole("heading", { name: "Your visits", level: 1 }));
    // The session now holds the new workshop's record, under the same password.
    const session = await page.evaluate(async () =>
      (await fetch("/api/auth/session")).json(),
    );
    expect(
      session.user.trades.map((x: { workshopName: string }) => x.workshopName),
    ).toContain("Pennock Fitted Furniture");
    await signIn(t, demoAccounts.trade.email, DEMO_PASSWORD);
    expect(problems).toEqual([]);
    await context.close();
  }, 60_000);
});
