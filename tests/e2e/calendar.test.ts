// The calendars of issue 6 in the browser: the workshop calendar in month and week views with
// bank holidays, a drag whose knock-on is read before saving, Save and the result after a reload;
// FullCalendar's run-time CSS applied under the production CSP (nonce) with no console errors;
// the demo plasterer's own calendar. Issue 15: each view is one GET /api/calendar for its days
// (the last range stays on screen while the next loads), and a job's programme is asked for only
// when one of its tasks starts to move. Chromium against the built client.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { startTestApp, type TestApp } from "../setup/test-app";
import { bankHolidayDays } from "../../shared/programme";
import { DEMO_WORKSHOP_NAME, demoAccounts } from "../factories/demo-scenario";
import {
  desktop,
  launchBrowser,
  phone,
  screensDir,
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

const signIn = (email: string, viewport = desktop) =>
  signInPage(browser, t.url!, email, { viewport });

/** The API requests a page makes from now on, as paths with their query. */
function apiRequests(page: Page): string[] {
  const seen: string[] = [];
  page.on("request", (r) => {
    const u = new URL(r.url());
    if (u.pathname.startsWith("/api/")) seen.push(u.pathname + u.search);
  });
  return seen;
}
const calendarRequests = (seen: string[]) =>
  seen.filter((p) => p.startsWith("/api/calendar?"));
const programmeRequests = (seen: string[]) =>
  seen.filter((p) => /^\/api\/jobs\/[^/]+\/programme$/.test(p));

/** A calendar event (FullCalendar's harness) by the task name in its label. */
const fcEvent = (page: Page, name: string) =>
  page.locator(".fc .fc-event", { hasText: name }).first();

/** The December bank holidays (England & Wales) of the current year, from the engine's calendar. */
function decemberBankHolidays(): string[] {
  return bankHolidayDays("GB-ENG", new Date().getFullYear())
    .map((d) => new Date(d * 86_400_000).toISOString().slice(0, 10))
    .filter((d) => d.slice(5, 7) === "12");
}

/** FullCalendar's Today button (disabled while today is in view). */
async function backToToday(page: Page): Promise<void> {
  const today = page.getByRole("button", { name: "Today" });
  if (await today.isEnabled()) await today.click();
}

/** Go to the month holding `yyyyMm` ("2026-12") with the calendar's own buttons. */
async function goToMonth(page: Page, yyyyMm: string): Promise<void> {
  for (let i = 0; i < 24; i++) {
    const date = await page
      .locator(".fc-daygrid-day:not(.fc-day-other)")
      .first()
      .getAttribute("data-date");
    if (!date) throw new Error("no day cells");
    if (date.slice(0, 7) === yyyyMm) return;
    await page
      .getByRole("button", {
        name: date.slice(0, 7) < yyyyMm ? "Next" : "Previous",
        exact: true,
      })
      .click();
  }
  throw new Error(`could not reach ${yyyyMm}`);
}

describe("workshop calendar", () => {
  it("renders month and week, shows the drag's knock-on before saving, saves it, keeps it after a reload", async () => {
    const { page, problems } = await signIn(demoAccounts.owner.email);
    const seen = apiRequests(page);
    // The calendar sits in the members' navigation and loads lazily.
    await page
      .getByRole("navigation", { name: "Main" })
      .getByRole("link", { name: "Calendar" })
      .click();
    await page.waitForURL(/\/calendar$/);
    await visible(fcEvent(page, "Template coving"));
    // One request for the month on screen (the range FullCalendar shows), no programme.
    const firstDay = await page
      .locator(".fc-daygrid-day[data-date]")
      .first()
      .getAttribute("data-date");
    const lastDay = await page
      .locator(".fc-daygrid-day[data-date]")
      .last()
      .getAttribute("data-date");
    expect(calendarRequests(seen)).toEqual([
      expect.stringMatching(
        new RegExp(
          `^/api/calendar\\?scope=workshop&id=[^&]+&from=${firstDay}&to=${lastDay}$`,
        ),
      ),
    ]);
    expect(programmeRequests(seen)).toEqual([]);

    // The next month while its answer is held back: the month before stays on screen with a
    // loading line, never the full-page loading state.
    let release: () => void = () => {};
    const held = new Promise<void>((r) => (release = r));
    const isCalendar = (u: URL) => u.pathname === "/api/calendar";
    await page.route(isCalendar, async (route) => {
      await held;
      await route.continue();
    });
    await page.getByRole("button", { name: "Next", exact: true }).click();
    await visible(
      page.getByRole("status").filter({ hasText: "Loading these days…" }),
    );
    expect(await page.locator(".fc").count()).toBe(1);
    expect(await page.getByText("Loading the calendar…").count()).toBe(0);
    release();
    await page.waitForFunction(
      () =>
        ![...document.querySelectorAll('[role="status"]')].some((e) =>
          e.textContent?.includes("Loading these days…"),
        ),
    );
    await page.unrouteAll({ behavior: "wait" });
    expect(calendarRequests(seen)).toHaveLength(2);
    await page.getByRole("button", { name: "Previous", exact: true }).click();
    await visible(fcEvent(page, "Template coving"));

    // FullCalendar's injected stylesheet applied: production CSP allows it by nonce only.
    const csp = await page.evaluate(async () => {
      const r = await fetch(location.href);
      return r.headers.get("content-security-policy") ?? "";
    });
    expect(csp).toMatch(/style-src 'self' 'nonce-[A-Za-z0-9+/=]+'/);
    expect(csp).toMatch(/script-src 'self'(;|$)/);
    const style = await page.evaluate(() => {
      const fc = document.querySelector(".fc")!;
      const frame = document.querySelector(".fc .fc-daygrid-day-frame")!;
      const meta = document.querySelector('meta[name="csp-nonce"]');
      return {
        display: getComputedStyle(fc).display,
        direction: getComputedStyle(fc).flexDirection,
        framePosition: getComputedStyle(frame).position,
        // The injected <style> carries the page's nonce (read from the meta by FullCalendar).
        nonced: (() => {
          const el = document.querySelector<HTMLStyleElement>(
            "style[data-fullcalendar]",
          );
          return !!el?.nonce && (el.sheet?.cssRules.length ?? 0) > 50;
        })(),
        metaFilled:
          !!meta && !/__SITECUE/.test(meta.getAttribute("content") ?? ""),
      };
    });
    expect(style).toEqual({
      display: "flex",
      direction: "column",
      framePosition: "relative",
      nonced: true,
      metaFilled: true,
    });

    // Month: demo events by name with their trade-kind labels.
    await visible(fcEvent(page, "Fill, caulk & paint"));
    expect(await fcEvent(page, "Template coving").innerText()).toContain(
      "Plasterer",
    );
    expect(await fcEvent(page, "Fill, caulk & paint").innerText()).toContain(
      "Decorator",
    );
    // This year's December bank holidays (GOV.UK: 25 and 28 Dec in 2026), then back to today.
    const december = decemberBankHolidays();
    await goToMonth(page, december[0].slice(0, 7));
    for (const d of december)
      expect(
        await page.locator(`.fc-daygrid-day[data-date="${d}"]`).innerText(),
      ).toContain("Bank holiday");
    await shot(page, "calendar-month-desktop");
    await backToToday(page);

    // Week view.
    await page.getByRole("button", { name: "Week", exact: true }).click();
    await visible(page.locator(".fc-dayGridWeek-view"));
    // Template coving is booked the next weekday: this week, or next week from a Friday.
    await page.waitForFunction(
      () =>
        ![...document.querySelectorAll('[role="status"]')].some((e) =>
          e.textContent?.includes("Loading these days…"),
        ),
    );
    if ((await fcEvent(page, "Template coving").count()) === 0)
      await page.getByRole("button", { name: "Next", exact: true }).click();
    await visible(fcEvent(page, "Template coving"));
    await page.waitForTimeout(300);
    // Still the week after the re-render datesSet causes.
    expect(await page.locator(".fc-dayGridMonth-view").count()).toBe(0);
    expect(await page.locator(".fc-daygrid-day").count()).toBe(7);
    await shot(page, "calendar-week-desktop");
    // A resize (the full-page shot makes one) keeps the week: FullCalendar re-initialises then.
    expect(await page.locator(".fc-daygrid-day").count()).toBe(7);
    await page.setViewportSize({ width: 1200, height: 800 });
    await page.waitForTimeout(300);
    expect(await page.locator(".fc-daygrid-day").count()).toBe(7);
    await page.setViewportSize(desktop);
    await page.getByRole("button", { name: "Month", exact: true }).click();
    await visible(page.locator(".fc-dayGridMonth-view"));

    // Drag "Hang doors" a week later: the knock-on shows before anything is saved.
    const doors = fcEvent(page, "Hang doors");
    const from = await doors.evaluate((el) =>
      el.closest("td[data-date]")!.getAttribute("data-date")!,
    );
    const target = new Date(`${from}T00:00:00Z`);
    target.setUTCDate(target.getUTCDate() + 7);
    const to = target.toISOString().slice(0, 10);
    if (to.slice(0, 7) !== from.slice(0, 7))
      throw new Error("pick another day");
    const a = (await doors.boundingBox())!;
    const b = (await page
      .locator(`.fc-daygrid-day[data-date="${to}"]`)
      .boundingBox())!;
    await page.mouse.move(a.x + 10, a.y + a.height / 2);
    await page.mouse.down();
    await page.mouse.move(a.x + 20, a.y + a.height / 2 + 10, { steps: 5 });
    await page.mouse.move(b.x + b.width / 2, b.y + b.height / 2, { steps: 15 });
    await page.mouse.up();

    const panel = page.locator("section", {
      has: page.getByRole("heading", { name: "Knock-on of moving Hang doors" }),
    });
    await visible(panel);
    const moved = panel.getByRole("list", { name: "Tasks that move" });
    await visible(moved);
    expect(await moved.innerText()).toContain("Hang doors");
    // Second fix is booked (a pin), so its booking must be re-confirmed rather than moved.
    const panelText = await panel.innerText();
    expect(panelText).toContain("Bookings to re-confirm");
    expect(panelText).toMatch(
      /Electrician second fix \(Brightwire Electrical\)/,
    );
    expect(await panel.getByTestId("handover-change").innerText()).toMatch(
      /^Planned finish (moves|stays)/,
    );
    await expect(panel.innerText()).resolves.toContain("Not saved yet");
    await shot(page, "calendar-drag-preview-desktop");
    // The drag asked for that one job's programme, once, and nothing else was read for it.
    const alcovesId = (
      await page.evaluate(async () => {
        const r = await fetch("/api/jobs");
        return ((await r.json()) as { jobs: { id: string; title: string }[] })
          .jobs;
      })
    ).find((j) => j.title === "Alcove cabinets, front room")!.id;
    expect(programmeRequests(seen)).toEqual([
      `/api/jobs/${alcovesId}/programme`,
    ]);

    await panel.getByRole("button", { name: "Save the move" }).click();
    await visible(
      page.getByRole("status").filter({ hasText: "Hang doors moved." }),
    );

    await page.reload();
    await visible(fcEvent(page, "Hang doors"));
    const after = await fcEvent(page, "Hang doors").evaluate((el) =>
      el.closest("td[data-date]")!.getAttribute("data-date")!,
    );
    expect(after).toBe(to);
    expect(problems).toEqual([]);
    await page.context().close();
  }, 90_000);

  it("works at 375 px as a day-by-day list with a keyboard Move control", async () => {
    const { page, problems } = await signIn(demoAccounts.fitter.email, phone);
    await page.goto(`${t.url}/calendar`);
    const entry = page
      .getByTestId("calendar-list-entry")
      .filter({ hasText: "Template coving" });
    await visible(entry);
    expect(await page.locator(".fc").count()).toBe(0);
    // A fitter has the workshop's calendar feed here too (issue 16), made by the same control.
    await visible(
      page
        .getByRole("region", { name: "Calendar feed" })
        .getByRole("button", { name: "Make a feed link" }),
    );
    await shot(page, "calendar-phone");
    const wide = await page.evaluate(
      () => document.documentElement.scrollWidth,
    );
    expect(wide).toBeLessThanOrEqual(375);
    // "Later →" asks for the next two weeks; "← Earlier" comes back to the ones already read.
    const phoneSeen = apiRequests(page);
    await page.getByRole("button", { name: "Later →" }).click();
    await page.waitForFunction(
      () =>
        ![...document.querySelectorAll('[role="status"]')].some((e) =>
          e.textContent?.includes("Loading these days…"),
        ),
    );
    expect(calendarRequests(phoneSeen)).toHaveLength(1);
    await page.getByRole("button", { name: "← Earlier" }).click();
    await visible(entry);

    const paint = page
      .getByTestId("calendar-list-entry")
      .filter({ hasText: "Fill, caulk & paint" })
      .first();
    // Painting is 6–7 weekdays ahead: in these two weeks or the next, by the day of the week.
    if ((await paint.count()) === 0)
      await page.getByRole("button", { name: "Later →" }).click();
    await paint
      .getByRole("button", { name: /^Move Fill, caulk & paint/ })
      .click();
    await paint.getByLabel("Not earlier than").press("ArrowUp");
    await paint.getByRole("button", { name: "Show the knock-on" }).click();
    await visible(
      page.getByRole("heading", {
        name: "Knock-on of moving Fill, caulk & paint",
      }),
    );
    await page.getByRole("button", { name: "Cancel" }).click();
    expect(
      await page.getByRole("heading", { name: /Knock-on of moving/ }).count(),
    ).toBe(0);
    expect(problems).toEqual([]);
    await page.context().close();
  }, 60_000);
});

describe("job calendar", () => {
  it("shows one job's tasks on the job page, loaded lazily", async () => {
    const { page, problems } = await signIn(demoAccounts.owner.email);
    const seen = apiRequests(page);
    await page
      .getByRole("link", { name: "Alcove cabinets, front room" })
      .first()
      .click();
    await page.waitForURL(/\/jobs\//);
    const section = page.locator("#job-calendar");
    await visible(
      section.locator(".fc .fc-event", { hasText: "Template coving" }),
    );
    expect(await section.locator(".fc").innerText()).not.toContain(
      "Fit wardrobe carcasses",
    );
    await section.screenshot({
      path: `${screensDir}/job-calendar-desktop.png`,
    });
    // One range request for this job; its programme only once something moves.
    expect(calendarRequests(seen)).toEqual([
      expect.stringMatching(/^\/api\/calendar\?scope=job&id=/),
    ]);
    expect(
      seen.filter((p) => p.startsWith("/api/calendar?scope=workshop")),
    ).toEqual([]);
    expect(problems).toEqual([]);
    await page.context().close();
  }, 60_000);
});

describe("trade calendar", () => {
  it("shows the demo plasterer their own visits", async () => {
    const { page, problems } = await signIn(demoAccounts.trade.email);
    const seen = apiRequests(page);
    await page
      .getByRole("navigation", { name: "Main" })
      .getByRole("link", { name: "My calendar" })
      .click();
    await page.waitForURL(/\/my-calendar$/);
    await visible(fcEvent(page, "Template coving"));
    await visible(fcEvent(page, "Fit coving & make good"));
    expect(await page.locator(".fc").innerText()).not.toContain(
      "Fill, caulk & paint",
    );
    expect(await page.locator("body").innerText()).toContain(
      "Hollin & Vane Joinery",
    );
    // One request for the trade's own month; no job read one by one.
    expect(calendarRequests(seen)).toEqual([
      expect.stringMatching(/^\/api\/calendar\?scope=me&from=/),
    ]);
    expect(seen.filter((p) => p.startsWith("/api/jobs/"))).toEqual([]);
    // Days off, entered once for every workshop: added here, shown on the calendar.
    const off = await page.evaluate(() => {
      const d = new Date();
      d.setDate(d.getDate() + 14);
      const p = (n: number) => String(n).padStart(2, "0");
      return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}`;
    });
    await page.getByLabel("Day off", { exact: true }).fill(off);
    await page.getByRole("button", { name: "Add day off" }).click();
    await visible(page.getByRole("list", { name: "Your days off" }));
    await visible(page.getByRole("heading", { name: "Calendar feed" }));
    await visible(page.locator(".fc-daygrid-day", { hasText: "Your day off" }));
    const december = decemberBankHolidays();
    await goToMonth(page, december[0].slice(0, 7));
    expect(
      await page
        .locator(`.fc-daygrid-day[data-date="${december[0]}"]`)
        .innerText(),
    ).toContain("Bank holiday");
    await backToToday(page);
    await shot(page, "my-calendar-desktop");
    expect(problems).toEqual([]);
    await page.context().close();

    const p = await signIn(demoAccounts.trade.email, phone);
    await p.page.goto(`${t.url}/my-calendar`);
    await visible(
      p.page
        .getByTestId("calendar-list-entry")
        .filter({ hasText: "Template coving" }),
    );
    await shot(p.page, "my-calendar-phone");
    expect(p.problems).toEqual([]);
    await p.page.context().close();
  }, 60_000);
});

describe("trade calendar across two workshops", () => {
  it("shows the plasterer their visits for both workshops in one view", async () => {
    const m = t.db.ds.manager;
    const {
      buildWorkshop,
      buildTrade,
      buildCustomer,
      buildJob,
      buildTask,
      buildBooking,
      linkTradeUser,
    } = await import("../factories/builders");
    const { User } = await import("../../server/modules/users/users.entity");
    const { Booking } =
      await import("../../server/modules/bookings/bookings.entity");
    const { Trade } = await import("../../server/modules/trades/trades.entity");
    const dev = await m.findOneByOrFail(User, {
      email: demoAccounts.trade.email,
    });
    const other = await buildWorkshop(m, { name: "Fenwold Fitted Interiors" });
    const record = await buildTrade(m, other, {
      kind: "plasterer",
      businessName: "Ashby Plaster & Coving",
      email: demoAccounts.trade.email,
    });
    await linkTradeUser(m, record, dev);
    const job = await buildJob(m, other, await buildCustomer(m, other), {
      title: "Hall panelling",
      area: "Fenwold",
    });
    const task = await buildTask(m, job, {
      name: "Run cornice returns",
      party: "plasterer",
      durationDays: 1,
    });
    // On the same day as one of the demo plasterer's visits, so both are in the month on screen.
    const { Workshop } =
      await import("../../server/modules/workshops/workshops.entity");
    const hollin = await m.findOneByOrFail(Workshop, {
      name: DEMO_WORKSHOP_NAME,
    });
    const demoTrade = await m.findOneByOrFail(Trade, {
      workshopId: hollin.id,
      businessName: "Ashby Plaster & Coving",
    });
    const demoVisit = await m.findOneOrFail(Booking, {
      where: { tradeId: demoTrade.id },
      order: { start: "ASC" },
    });
    const day = demoVisit.start.slice(0, 10);
    await buildBooking(m, task, record, {
      state: "sent",
      start: `${day}T08:00`,
      finish: `${day}T16:30`,
    });

    const { page, problems } = await signIn(demoAccounts.trade.email);
    await page.goto(`${t.url}/my-calendar`);
    const { Task } =
      await import("../../server/modules/programme/programme.entity");
    const demoTask = await m.findOneByOrFail(Task, { id: demoVisit.taskId });
    await visible(fcEvent(page, demoTask.name));
    await visible(fcEvent(page, "Run cornice returns"));
    const body = await page.locator("body").innerText();
    expect(body).toContain("Hollin & Vane Joinery");
    expect(body).toContain("Fenwold Fitted Interiors");
    await shot(page, "my-calendar-two-workshops-desktop");
    expect(problems).toEqual([]);
    await page.context().close();

    // The first workshop sees the plasterer's time for the other only as "busy".
    const owner = await signIn(demoAccounts.owner.email);
    await owner.page.goto(`${t.url}/calendar`);
    await owner.page
      .getByLabel("Business")
      .selectOption({ label: "Ashby Plaster & Coving" });
    await visible(
      owner.page.locator(`.fc-daygrid-day[data-date="${day}"]`, {
        hasText: "Busy (another workshop)",
      }),
    );
    const ownerText = await owner.page.locator("body").innerText();
    expect(ownerText).not.toContain("Run cornice returns");
    expect(ownerText).not.toContain("Hall panelling");
    await shot(owner.page, "calendar-busy-elsewhere-desktop");
    expect(owner.problems).toEqual([]);
    await owner.page.context().close();
  }, 60_000);
});
