// The maker plans a job in the browser (issue 4): a new job from a starter, a link added, a task
// dragged two working days later (and moved by keyboard), the named knock-on read before saving,
// then saved, reloaded and seen the same. Chromium against the built client, production CSP.
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Locator, Page, Request } from "playwright-core";
import { workingDaysBetween } from "../../shared/programme";
import { startTestApp, type TestApp } from "../setup/test-app";
import { demoAccounts } from "../factories/demo-scenario";
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

const signIn = (viewport = desktop) =>
  signInPage(browser, t.url!, demoAccounts.owner.email, { viewport });

// The site and workshop calendars of a new demo job: Mon–Fri, England's bank holidays.
const calendar = { id: "workshop", holidayRegion: "GB-ENG" as const };
/** The `n`th working day after `date` ("YYYY-MM-DD"). */
function workingDayAfter(date: string, n: number): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + 40);
  return workingDaysBetween(
    calendar,
    date,
    d.toISOString().slice(0, 10),
  ).filter((x) => x > date)[n - 1];
}
const WEEKDAY = ["Sun", "Mon", "Tue", "Wed", "Thu", "Fri", "Sat"];
const MONTH = [
  "Jan",
  "Feb",
  "Mar",
  "Apr",
  "May",
  "Jun",
  "Jul",
  "Aug",
  "Sep",
  "Oct",
  "Nov",
  "Dec",
];
/** "Thu 14 Jan" as the screen writes it (the year only outside this year). */
function dayText(date: string): string {
  const d = new Date(`${date}T00:00:00Z`);
  const year =
    d.getUTCFullYear() !== new Date().getFullYear()
      ? ` ${d.getUTCFullYear()}`
      : "";
  return `${WEEKDAY[d.getUTCDay()]} ${d.getUTCDate()} ${MONTH[d.getUTCMonth()]}${year}`;
}

const taskItem = (page: Page, name: string): Locator =>
  page
    .getByRole("list", { name: "Tasks" })
    .getByRole("listitem")
    .filter({ has: page.getByRole("heading", { name, exact: true }) });
const bar = (page: Page, name: string): Locator =>
  page.getByRole("button", {
    name: new RegExp(`^${name.replace(/[&()]/g, "\\$&")}: `),
  });
const knockOn = (page: Page): Locator =>
  page.getByRole("region", { name: /^Knock-on of moving/ });

/** The planned start date the bar's label gives ("Survey & measure: Thu 14 Jan to …"). */
async function columnX(page: Page, date: string): Promise<number> {
  const box = await page.locator(`[data-date="${date}"]`).boundingBox();
  if (!box) throw new Error(`no day column for ${date}`);
  return box.x;
}

/**
 * Watches for the page reading a whole programme (GET /api/jobs/:id/programme); `stop` ends the
 * watch and gives the reads seen. Edits answer with what changed, so saving needs none.
 */
function programmeReads(page: Page): { stop: () => string[] } {
  const reads: string[] = [];
  const onRequest = (r: Request) => {
    if (
      r.method() === "GET" &&
      /^\/api\/jobs\/[^/]+\/programme$/.test(new URL(r.url()).pathname)
    )
      reads.push(r.url());
  };
  page.on("request", onRequest);
  return {
    stop: () => {
      page.off("request", onRequest);
      return reads;
    },
  };
}

describe("the maker's programme screen", () => {
  let jobUrl = "";

  it("creates a job from a starter, adds a link, drags a task and saves the knock-on", async () => {
    const { page, problems } = await signIn();
    await page.getByRole("button", { name: "New job" }).click();
    const title = "Alcove pair, back bedroom";
    await page.getByLabel("Title").fill(title);
    const customer = page.getByLabel("Customer");
    await visible(customer.locator("option").nth(1), 10_000).catch(
      () => undefined,
    );
    await customer.selectOption({ index: 1 });
    await page.getByLabel("Site address").fill("3 Heron Row, Wetherfold");
    await page.getByLabel("Postcode").fill("QX1 4HR");
    await page
      .getByLabel("Area", { exact: true })
      .fill("Heron Row, Wetherfold");
    await page
      .getByLabel("Start from")
      .selectOption({ label: "Alcove cabinets (pair)" });
    await page.getByRole("button", { name: "Create job" }).click();
    await visible(page.getByRole("heading", { name: title }));

    await page.getByRole("link", { name: "Plan the programme" }).click();
    await visible(page.getByRole("heading", { name: `Programme: ${title}` }));
    for (const name of [
      "Survey & measure",
      "Fix carcasses & scribes",
      "Template coving",
      "Fill, caulk & paint",
      "Walk-round with the customer",
    ]) {
      await visible(taskItem(page, name));
    }
    await visible(
      taskItem(page, "Template coving").getByText(
        "Waits for Fix carcasses & scribes — finish-to-start",
      ),
    );
    await visible(
      taskItem(page, "Fit coving & make good").getByText(
        "Waits for Template coving — finish-to-start, 2 working days after",
      ),
    );
    await visible(
      taskItem(page, "Fill, caulk & paint").getByText(
        /24 hours after — drying/,
      ),
    );
    await visible(
      taskItem(page, "Fix carcasses & scribes")
        .getByText(/Caution/)
        .first(),
    );
    jobUrl = page.url();

    // Add a link: the electrician second-fixes after the decorator (faceplates on painted walls).
    await page.getByRole("button", { name: "Add link" }).click();
    const linkForm = page.getByRole("form", { name: "New link" });
    await linkForm
      .getByLabel("Waiting task")
      .selectOption({ label: "Electrician second fix" });
    await linkForm
      .getByLabel("Waits for")
      .selectOption({ label: "Fill, caulk & paint" });
    await linkForm
      .getByLabel("When it can go")
      .selectOption({ label: "after it finishes" });
    // The answer is what changed, laid over the cached programme: the page shows the link and
    // its knock-on without reading the programme again (issue 15).
    let reads = programmeReads(page);
    await linkForm.getByRole("button", { name: "Add link" }).click();
    await visible(
      taskItem(page, "Electrician second fix").getByText(
        "Waits for Fill, caulk & paint — finish-to-start",
      ),
    );
    expect(reads.stop()).toEqual([]);

    // What the survey and the programme's finish are now, read from the page.
    const surveyLabel = (await bar(page, "Survey & measure").getAttribute(
      "aria-label",
    ))!;
    const finishBefore = (await page
      .getByTestId("planned-finish")
      .textContent())!.trim();
    expect(surveyLabel).toContain("Survey & measure: ");
    await shot(page, "programme-desktop");

    // Keyboard: the survey bar moved a working day by →, reviewed with Enter, cancelled with Escape.
    await bar(page, "Survey & measure").focus();
    await page.keyboard.press("ArrowRight");
    await visible(knockOn(page));
    await visible(knockOn(page).getByText("Fix carcasses & scribes"));
    await page.keyboard.press("Enter");
    expect(await page.evaluate(() => document.activeElement?.id)).toBe(
      "knock-on-heading",
    );
    await page.keyboard.press("Escape");
    await knockOn(page).waitFor({ state: "detached" });

    // Find the survey's start date from the API the page uses, then drag two working days later.
    const jobId = new URL(jobUrl).pathname.split("/")[2];
    const before = await page.evaluate(
      async (id) => (await fetch(`/api/jobs/${id}/programme`)).json(),
      jobId,
    );
    const survey = before.tasks.find(
      (x: { name: string }) => x.name === "Survey & measure",
    );
    const surveyStart: string = before.result.tasks
      .find((x: { id: string }) => x.id === survey.id)
      .plannedStart.slice(0, 10);
    const finishDate: string = before.result.finish.slice(0, 10);
    const target = workingDayAfter(surveyStart, 2);
    expect(finishBefore.startsWith(dayText(finishDate))).toBe(true);

    const box = (await bar(page, "Survey & measure").boundingBox())!;
    const dx =
      (await columnX(page, target)) - (await columnX(page, surveyStart));
    const y = box.y + box.height / 2;
    await page.mouse.move(box.x + 5, y);
    await page.mouse.down();
    for (let i = 1; i <= 6; i++)
      await page.mouse.move(box.x + 5 + (dx * i) / 6, y);
    await page.mouse.up();

    // The named knock-on, before saving: what moves, by how much, and the handover.
    const panel = knockOn(page);
    await visible(panel);
    await shot(page, "programme-knock-on-desktop");
    const moves = panel.getByRole("list", { name: "Tasks that move" });
    // A straight finish-to-start chain on Mon–Fri moves exactly as far as the survey.
    for (const name of [
      "Survey & measure",
      "Electrician first fix (cabinet lights)",
      "Fix carcasses & scribes",
      "Template coving",
    ]) {
      await visible(
        moves
          .getByRole("listitem")
          .filter({ hasText: name })
          .filter({ hasText: "moves 2 working days later" }),
      );
    }
    // Past the 24-hour drying lag the painting and handover move too (by what the weekend allows).
    for (const name of [
      "Fit coving & make good",
      "Fill, caulk & paint",
      "Walk-round with the customer",
    ]) {
      await visible(
        moves
          .getByRole("listitem")
          .filter({ hasText: name })
          .filter({ hasText: /moves .* later/ }),
      );
    }
    const sentence = (await panel
      .getByTestId("handover-change")
      .textContent())!;
    const m =
      /^Planned finish moves from (\w{3} \d{1,2} \w{3}(?: \d{4})?) to (\w{3} \d{1,2} \w{3}(?: \d{4})?)/.exec(
        sentence,
      );
    expect(m, sentence).not.toBeNull();
    expect(m![1]).toBe(dayText(finishDate));
    const promised = m![2];
    // Nothing saved yet: the server still has the old finish.
    const still = await page.evaluate(
      async (id) => (await fetch(`/api/jobs/${id}/programme`)).json(),
      jobId,
    );
    expect(still.result.finish.slice(0, 10)).toBe(finishDate);

    reads = programmeReads(page);
    await panel.getByRole("button", { name: "Save the move" }).click();
    await panel.waitFor({ state: "detached" });
    await visible(
      page.getByRole("status").getByText("Survey & measure moved."),
    );
    // The server's own answer agrees with the browser's preview.
    await visible(
      page
        .getByRole("status")
        .getByText(
          `Planned finish moves from ${dayText(finishDate)} to ${promised}`,
        ),
    );
    expect(reads.stop()).toEqual([]);
    const after = await page.evaluate(
      async (id) => (await fetch(`/api/jobs/${id}/programme`)).json(),
      jobId,
    );
    const expectedFinish: string = after.result.finish.slice(0, 10);
    expect(dayText(expectedFinish)).toBe(promised);
    expect(expectedFinish > finishDate).toBe(true);
    await visible(
      page.getByTestId("planned-finish").getByText(dayText(expectedFinish)),
    );
    await visible(
      taskItem(page, "Survey & measure").getByText(
        new RegExp(`Planned ${dayText(target)}`),
      ),
    );
    await shot(page, "programme-saved-desktop");

    // After a reload the same dates come back from the server.
    await page.reload();
    await visible(page.getByRole("heading", { name: `Programme: ${title}` }));
    await visible(
      page.getByTestId("planned-finish").getByText(dayText(expectedFinish)),
    );
    await visible(
      taskItem(page, "Survey & measure").getByText(
        new RegExp(`Planned ${dayText(target)}`),
      ),
    );
    await visible(
      taskItem(page, "Survey & measure").getByText(
        `Not earlier than ${dayText(target)}`,
      ),
    );
    expect(
      await bar(page, "Survey & measure").getAttribute("aria-label"),
    ).toContain(`Survey & measure: ${dayText(target)}`);
    expect(problems).toEqual([]);
    await page.context().close();
  });

  it("reads on a phone: the list first, the bar view scrolls sideways", async () => {
    const { page, problems } = await signIn(phone);
    await page.goto(jobUrl);
    await visible(taskItem(page, "Survey & measure"));
    const overflow = await page.evaluate(
      () =>
        document.documentElement.scrollWidth -
        document.documentElement.clientWidth,
    );
    expect(overflow).toBeLessThanOrEqual(1);
    await shot(page, "programme-phone");
    await page.screenshot({
      path: path.join(screensDir, "programme-phone-top.png"),
    });
    await taskItem(page, "Fix carcasses & scribes").scrollIntoViewIfNeeded();
    await page.screenshot({
      path: path.join(screensDir, "programme-phone-task.png"),
    });
    expect(problems).toEqual([]);
    await page.context().close();
  });

  it("shows a stale edit's conflict in words and offers the reload", async () => {
    const { page, problems } = await signIn();
    await page.goto(jobUrl);
    await visible(taskItem(page, "Hang doors"));
    // Someone else edits the programme after this page loaded it.
    const jobId = new URL(jobUrl).pathname.split("/")[2];
    const status = await page.evaluate(async (id) => {
      const session = await (await fetch("/api/auth/session")).json();
      const prog = await (await fetch(`/api/jobs/${id}/programme`)).json();
      const task = prog.tasks.find(
        (x: { name: string }) => x.name === "Hang doors",
      );
      const res = await fetch(`/api/jobs/${id}/tasks/${task.id}`, {
        method: "PATCH",
        headers: {
          "Content-Type": "application/json",
          "X-CSRF-Token": session.csrfToken,
        },
        body: JSON.stringify({
          version: prog.version,
          internalNote: "Doors due Thursday.",
        }),
      });
      return res.status;
    }, jobId);
    expect(status).toBe(200);

    await taskItem(page, "Hang doors")
      .getByRole("button", { name: "Edit Hang doors" })
      .click();
    const form = page.getByRole("form", { name: "Edit Hang doors" });
    await form.getByLabel("Duration (working days)").fill("1.5");
    await form.getByRole("button", { name: "Save task" }).click();
    const banner = page.getByRole("alert").filter({
      has: page.getByRole("button", { name: "Reload the programme" }),
    });
    await visible(banner);
    await visible(banner.getByText(/Someone else changed/));
    await shot(page, "programme-conflict-desktop");
    await banner.getByRole("button", { name: "Reload the programme" }).click();
    await banner.waitFor({ state: "detached" });
    // After the reload the same edit goes through on the new version.
    await form.getByRole("button", { name: "Save task" }).click();
    await form.waitFor({ state: "detached" });
    await visible(taskItem(page, "Hang doors").getByText("1.5 days"));
    // The browser logs the refused request itself; nothing else may be in the console.
    expect(problems.filter((p) => !p.includes("409"))).toEqual([]);
    await page.context().close();
  });
});

describe("done work on the demo's programme (issue 16)", () => {
  it("says when a done task was done, with no float, and a milestone offers only Mark done", async () => {
    const { page, problems } = await signIn();
    await page.goto(`${t.url}/jobs`);
    const jobs = (await page.evaluate(async () =>
      (await fetch("/api/jobs")).json(),
    )) as { jobs: { id: string; title: string }[] };
    const alcoves = jobs.jobs.find(
      (j) => j.title === "Alcove cabinets, front room",
    )!;
    const prog = (await page.evaluate(
      async (id) => (await fetch(`/api/jobs/${id}/programme`)).json(),
      alcoves.id,
    )) as {
      tasks: {
        name: string;
        actualStart: string | null;
        actualFinish: string | null;
      }[];
    };
    const survey = prog.tasks.find((x) => x.name === "Survey & measure")!;
    expect(survey.actualFinish).not.toBeNull();
    await page.goto(`${t.url}/jobs/${alcoves.id}/programme`);
    const item = taskItem(page, "Survey & measure");
    await visible(item);
    const text = (await item.innerText()).replace(/\s+/g, " ");
    expect(text).toContain(
      `Finished ${dayText(survey.actualFinish!.slice(0, 10))}`,
    );
    expect(text).not.toContain("Float");
    expect(text).not.toContain("Planned");
    expect(text).not.toContain("Critical");
    const milestone = taskItem(page, "Walk-round with the customer");
    await visible(milestone);
    expect(
      await milestone.getByRole("button", { name: /^Mark started/ }).count(),
    ).toBe(0);
    await visible(milestone.getByRole("button", { name: /^Mark done/ }));
    expect(problems).toEqual([]);
    await page.context().close();
  });
});
