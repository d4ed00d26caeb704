// Scenarios 1, 2 and 6 of the brief in the browser (issue 5): the owner books the plasterer for
// "Template coving" from their first free start and sends; the invitation e-mail is caught; the
// plasterer opens its link on a 375 px phone without an account, sees the task, the area and the
// date, confirms and then sees the full address; the owner's job page shows the booking confirmed
// "by link". A start on a day the plasterer is booked on another job is flagged with their next
// free start. Chromium against the built client, production CSP, axe-core on the link page.
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Locator, Page } from "playwright-core";
import type {
  BookingOptionsResponse,
  BookingResponse,
} from "../../shared/schemas";
import { startTestApp, type TestApp } from "../setup/test-app";
import { demoAccounts, demoJobTitles } from "../factories/demo-scenario";
import {
  apiGet,
  axeSeriousOrWorse,
  dayText,
  half,
  launchBrowser,
  phone,
  screensDir,
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

const signIn = () => signInPage(browser, t.url!, demoAccounts.owner.email);

const plasterer = "Ashby Plaster & Coving";
const jobTitle = "Alcove cabinets, dining room";
const siteAddress = "9 Wren Street, Wetherfold";
const postcode = "QX3 8WS";
const area = "Wren Street, Wetherfold";

const taskItem = (page: Page, name: string): Locator =>
  page
    .getByRole("list", { name: "Tasks" })
    .getByRole("listitem")
    .filter({ has: page.getByRole("heading", { name, exact: true }) });

describe("booking a trade and their answer by link", () => {
  let jobId = "";
  let page: Page;
  let problems: string[];
  let link = "";
  let firstFree = "";

  it("the owner books the plasterer for Template coving from their first free start and sends", async () => {
    ({ page, problems } = await signIn());
    // A fresh job from the starter: the demo alcove job's coving tasks are booked already.
    await page.getByRole("button", { name: "New job" }).click();
    await page.getByLabel("Title").fill(jobTitle);
    const customer = page.getByLabel("Customer");
    await visible(customer.locator("option").nth(1)).catch(() => undefined);
    await customer.selectOption({ index: 1 });
    await page.getByLabel("Site address").fill(siteAddress);
    await page.getByLabel("Postcode").fill(postcode);
    await page.getByLabel("Area", { exact: true }).fill(area);
    await page
      .getByLabel("Start from")
      .selectOption({ label: "Alcove cabinets (pair)" });
    await page.getByRole("button", { name: "Create job" }).click();
    await visible(page.getByRole("heading", { name: jobTitle }));
    jobId = new URL(page.url()).pathname.split("/")[2];

    await page.getByRole("link", { name: "Plan the programme" }).click();
    await visible(
      page.getByRole("heading", { name: `Programme: ${jobTitle}` }),
    );
    const coving = taskItem(page, "Template coving");
    await visible(coving.getByText("Not booked yet."));
    await coving
      .getByRole("button", { name: "Book a plasterer for Template coving" })
      .click();
    const panel = page.getByRole("form", {
      name: "Book a plasterer for Template coving",
    });
    await visible(panel);

    // What the panel shows comes from the same options the API gives.
    const programme = await apiGet<{ tasks: { id: string; name: string }[] }>(
      page,
      `/api/jobs/${jobId}/programme`,
    );
    const taskId = programme.tasks.find(
      (x) => x.name === "Template coving",
    )!.id;
    const options = await apiGet<BookingOptionsResponse>(
      page,
      `/api/jobs/${jobId}/tasks/${taskId}/booking-options`,
    );
    const ashby = options.trades.find((x) => x.businessName === plasterer)!;
    expect(ashby.firstFree).not.toBeNull();
    firstFree = ashby.firstFree!.start;
    const choice = panel.locator("label").filter({ hasText: plasterer });
    await visible(
      choice.getByText(`Free from ${dayText(firstFree)} ${half(firstFree)}`),
    );
    await visible(
      // This job has no handover agreed yet: the window keeps the programme's planned finish.
      panel.getByText(/keeps?\s+the planned finish\./),
    );
    // The task is done at height: its caution is shown before booking.
    await visible(page.getByText(/Caution/).first());
    await choice.click();
    expect(await panel.getByLabel("Start", { exact: true }).inputValue()).toBe(
      firstFree.slice(0, 10),
    );
    await shot(page, "booking-panel-desktop");
    await panel.screenshot({
      path: path.join(screensDir, "booking-panel-detail-desktop.png"),
    });

    await panel.getByRole("button", { name: `Send to ${plasterer}` }).click();
    await visible(
      page.getByText(`Sent to ${plasterer} for ${dayText(firstFree)}`),
    );
    await visible(coving.getByText("Sent", { exact: true }));
    await shot(page, "booking-sent-desktop");

    const mail = await t.mail.waitFor(
      (m) =>
        m.to.includes(demoAccounts.trade.email) &&
        m.links.some((l) => l.includes("/b/")) &&
        m.text.includes("Template coving") &&
        m.text.includes(area),
      15_000,
    );
    link = mail.links.find((l) => l.includes("/b/"))!;
    expect(link.startsWith(`${t.url}/b/`)).toBe(true);
  }, 90_000);

  it("the plasterer opens the link on a phone, without an account, and confirms", async () => {
    const context = await browser.newContext({ viewport: phone });
    const trade = await context.newPage();
    const tradeProblems = watchConsole(trade);
    await trade.goto(link);
    await visible(trade.getByRole("heading", { name: "Template coving" }));
    expect(new URL(trade.url()).pathname.startsWith("/b/")).toBe(true);
    await visible(trade.getByText("Booking from Hollin & Vane Joinery"));
    await visible(trade.getByText(`For ${plasterer}`));
    await visible(trade.getByText(area, { exact: true }));
    await visible(trade.getByText(new RegExp(`^${dayText(firstFree)}, `)));
    await visible(trade.getByText(/shown once you\s+confirm/));
    // Not yet confirmed and not shared: no street address on the page.
    expect(await trade.getByText(siteAddress).count()).toBe(0);
    await visible(trade.getByText(/Fix carcasses & scribes/));
    // No handover agreed on this job: the window keeps the programme's planned finish.
    await visible(trade.getByText("Start dates that keep the planned finish"));
    await shot(trade, "booking-link-phone");
    expect(await axeSeriousOrWorse(trade)).toEqual([]);

    // The propose picker marks dates (opened and closed again, nothing sent).
    await trade.getByRole("button", { name: "Propose another start" }).click();
    await visible(
      trade.getByRole("group", { name: "Choose the start you propose" }),
    );
    await shot(trade, "booking-link-propose-phone");
    await trade.getByRole("button", { name: "Propose another start" }).click();

    await trade
      .getByRole("button", { name: `Confirm ${dayText(firstFree)}` })
      .click();
    await visible(
      trade.getByText(`You confirmed ${dayText(firstFree)} — thank you.`),
    );
    await visible(trade.getByText(`${siteAddress}, ${postcode}`));
    await shot(trade, "booking-link-confirmed-phone");

    // A repeat visit shows the answer again.
    await trade.reload();
    await visible(
      trade.getByText(`You confirmed ${dayText(firstFree)} — thank you.`),
    );
    await visible(trade.getByText(`${siteAddress}, ${postcode}`));
    expect(await axeSeriousOrWorse(trade)).toEqual([]);
    expect(tradeProblems).toEqual([]);
    await context.close();
  }, 60_000);

  it("the owner's job page shows the booking confirmed, by link", async () => {
    await page.goto(`${t.url}/jobs/${jobId}`);
    const bookings = page.getByRole("list", { name: "Bookings" });
    const item = bookings.getByRole("listitem", {
      name: `${plasterer}, Template coving`,
    });
    await visible(item);
    await visible(item.getByText("Confirmed", { exact: true }));
    await visible(item.getByText(`${dayText(firstFree)}, ${half(firstFree)}`));
    await item.getByText(/^History/).click();
    await visible(item.getByText(`${plasterer}, by link`));
    await shot(page, "booking-confirmed-job-desktop");
    await page.locator("#job-bookings").screenshot({
      path: path.join(screensDir, "booking-confirmed-detail-desktop.png"),
    });

    // Copy link: onto the clipboard, to paste into a text message.
    await page
      .context()
      .grantPermissions(["clipboard-read", "clipboard-write"], {
        origin: t.url!,
      });
    await item
      .getByRole("button", {
        name: `Copy link: the confirmation link for ${plasterer}`,
      })
      .click();
    await visible(item.getByText("Link copied", { exact: false }));
    expect(await page.evaluate(() => navigator.clipboard.readText())).toMatch(
      new RegExp(`^${t.url}/b/`),
    );

    const list = await apiGet<{ bookings: BookingResponse[] }>(
      page,
      `/api/jobs/${jobId}/bookings`,
    );
    const b = list.bookings.find((x) => x.taskName === "Template coving")!;
    expect(b.state).toBe("confirmed");
    expect(b.history.at(-1)?.channel).toBe("link");
  }, 60_000);

  it("a start on a day the plasterer is booked on another job is flagged with their next free start", async () => {
    // The demo alcove job has Ashby confirmed for its coving: try that day for this job's coving.
    const jobs = await apiGet<{ jobs: { id: string; title: string }[] }>(
      page,
      `/api/jobs`,
    );
    const demo = jobs.jobs.find((j) => j.title === demoJobTitles.alcoves)!;
    const demoBookings = await apiGet<{ bookings: BookingResponse[] }>(
      page,
      `/api/jobs/${demo.id}/bookings`,
    );
    const busy = demoBookings.bookings.find(
      (b) => b.taskName === "Fit coving & make good",
    )!;

    await page.goto(`${t.url}/jobs/${jobId}/programme`);
    const coving = taskItem(page, "Fit coving & make good");
    await coving
      .getByRole("button", {
        name: "Book a plasterer for Fit coving & make good",
      })
      .click();
    const panel = page.getByRole("form", {
      name: "Book a plasterer for Fit coving & make good",
    });
    await visible(panel);
    await panel
      .getByLabel("Start", { exact: true })
      .fill(busy.start.slice(0, 10));
    await panel.getByRole("radio", { name: "Morning" }).first().check();
    await panel.getByRole("button", { name: "Save as draft" }).click();
    const alert = panel.getByRole("alert").filter({
      hasText: "That start does not work for them",
    });
    await visible(alert);
    await visible(alert.getByText(plasterer, { exact: false }).first());
    const next = alert.getByRole("button", {
      name: /^Use their next free start/,
    });
    await visible(next);
    await visible(alert.getByRole("button", { name: "Book anyway" }));
    await shot(page, "booking-clash-desktop");
    await alert.screenshot({
      path: path.join(screensDir, "booking-clash-detail-desktop.png"),
    });
    await next.click();
    expect(
      await panel.getByLabel("Start", { exact: true }).inputValue(),
    ).not.toBe(busy.start.slice(0, 10));
    // The 409 itself is logged by the browser as a failed request; nothing else may be.
    expect(problems.filter((p) => !p.includes("409"))).toEqual([]);
  }, 60_000);

  it("a link used after the workshop cancelled the booking says so, with the day, and offers nothing to confirm", async () => {
    // The plasterer has the page open (confirmed earlier) when the owner cancels.
    const context = await browser.newContext({ viewport: phone });
    const trade = await context.newPage();
    const tradeProblems = watchConsole(trade);
    await trade.goto(link);
    await visible(trade.getByRole("button", { name: "Can't make it" }));

    await page.goto(`${t.url}/jobs/${jobId}`);
    const item = page
      .getByRole("list", { name: "Bookings" })
      .getByRole("listitem", { name: `${plasterer}, Template coving` });
    await item.getByRole("button", { name: "Cancel booking" }).click();
    const form = item.getByRole("form", {
      name: `Cancel the booking of ${plasterer}`,
    });
    await form.getByLabel("Why is it cancelled").fill("Customer postponed");
    await form.getByRole("button", { name: "Cancel the booking" }).click();
    await visible(page.getByText(`The booking of ${plasterer} is cancelled.`));

    await trade.getByRole("button", { name: "Can't make it" }).click();
    await trade.getByLabel("Why can't you make it?").fill("Away that week");
    await trade.getByRole("button", { name: "Send: I can't make it" }).click();
    // Today where the job is, as the screens write it.
    const today = new Intl.DateTimeFormat("en-CA", {
      timeZone: "Europe/London",
    }).format(new Date());
    const banner = trade.getByRole("status").filter({
      hasText: "This booking was cancelled",
    });
    await visible(banner);
    await visible(
      banner.getByText(
        `Hollin & Vane Joinery cancelled it on ${dayText(today)}. There is nothing to confirm`,
        { exact: false },
      ),
    );
    expect(await trade.getByText(/dates of this booking/).count()).toBe(0);
    expect(await trade.getByText(/once you\s+confirm/).count()).toBe(0);
    for (const name of ["Can't make it", "Propose another start"])
      expect(await trade.getByRole("button", { name }).count()).toBe(0);
    await shot(trade, "booking-link-cancelled-phone");
    await trade.reload();
    await visible(banner);
    expect(await trade.getByRole("button", { name: /^Confirm/ }).count()).toBe(
      0,
    );
    expect(await axeSeriousOrWorse(trade)).toEqual([]);
    // The 409 itself is logged by the browser as a failed request; nothing else may be.
    expect(tradeProblems.filter((p) => !p.includes("409"))).toEqual([]);
    await context.close();
  }, 60_000);

  it("an invalid link says so plainly", async () => {
    const context = await browser.newContext({ viewport: phone });
    const p = await context.newPage();
    await p.goto(`${t.url}/b/not-a-real-token-not-a-real-token`);
    await visible(
      p.getByText(
        "This link is not valid or has expired — ask the workshop for a new one.",
      ),
    );
    expect(new URL(p.url()).pathname.startsWith("/b/")).toBe(true);
    await shot(p, "booking-link-invalid-phone");
    await context.close();
  }, 30_000);
});

describe("the maker's actions on the demo job's bookings", () => {
  it("records a proposal by phone and accepts it, records a decline by text and offers the next trade", async () => {
    const { page, problems } = await signIn();
    const jobs = await apiGet<{ jobs: { id: string; title: string }[] }>(
      page,
      `/api/jobs`,
    );
    const demo = jobs.jobs.find((j) => j.title === demoJobTitles.alcoves)!;
    await page.goto(`${t.url}/jobs/${demo.id}`);
    const bookings = page.getByRole("list", { name: "Bookings" });
    const template = bookings.getByRole("listitem", {
      name: `${plasterer}, Template coving`,
    });
    await visible(template.getByText("Sent", { exact: true }));

    // The plasterer rang to propose a start two days later.
    const before = (
      await apiGet<{ bookings: BookingResponse[] }>(
        page,
        `/api/jobs/${demo.id}/bookings`,
      )
    ).bookings.find((b) => b.taskName === "Template coving")!;
    const d = new Date(`${before.start.slice(0, 10)}T12:00:00Z`);
    do d.setUTCDate(d.getUTCDate() + 1);
    while (d.getUTCDay() === 0 || d.getUTCDay() === 6);
    const proposed = d.toISOString().slice(0, 10);
    await template.getByRole("button", { name: "Record answer" }).click();
    const form = template.getByRole("form", {
      name: `Record ${plasterer}'s answer`,
    });
    await form.getByLabel("By phone").check();
    await form.getByLabel("Proposes another start").check();
    await form.getByLabel("The start they propose").fill(proposed);
    await form.getByLabel("Note").fill("Rang: the morning after suits better");
    await form.getByRole("button", { name: "Record answer" }).click();
    await visible(template.getByText("Date proposed", { exact: true }));
    await visible(
      template.getByText(`proposes to start ${dayText(proposed)} instead`, {
        exact: false,
      }),
    );
    await template.getByText(/^History/).click();
    await visible(
      template.getByText(
        `${plasterer}, by phone (recorded by ${demoAccounts.owner.name})`,
      ),
    );
    await shot(page, "booking-proposed-job-desktop");
    await template
      .getByRole("button", { name: `Accept ${dayText(proposed)}` })
      .click();
    await visible(template.getByText(new RegExp(`^${dayText(proposed)}, `)));
    await visible(template.getByText("Confirmed", { exact: true }));

    // The electrician texted that they can't make the second fix: declined, book another.
    const second = bookings.getByRole("listitem", {
      name: "Brightwire Electrical, Electrician second fix",
    });
    await second.getByRole("button", { name: "Record answer" }).click();
    const f2 = second.getByRole("form", {
      name: "Record Brightwire Electrical's answer",
    });
    await f2.getByLabel("By text message").check();
    await f2.getByLabel("Can't make it").check();
    await f2.getByLabel("Note").fill("Away that week");
    await f2.getByRole("button", { name: "Record answer" }).click();
    await visible(second.getByText("Declined", { exact: true }));
    // Offered once, on the declined booking, not again under "Not booked yet".
    expect(
      await page
        .getByRole("button", {
          name: "Book an electrician for Electrician second fix",
        })
        .count(),
    ).toBe(0);
    await second
      .getByRole("button", { name: "Book another electrician" })
      .click();
    const panel = second.getByRole("form", {
      name: "Book an electrician for Electrician second fix",
    });
    await visible(panel);
    // The only electrician declined: listed (last), and flagged.
    await visible(panel.getByText("Declined this task before"));
    await shot(page, "booking-declined-job-desktop");
    await panel.getByRole("button", { name: "Cancel" }).click();
    expect(problems).toEqual([]);
  }, 90_000);
});
