// The job thread in the browser (issue 7): the owner posts a "Trades & workshop" and a "Workshop
// only" message; the plasterer, already on the job page on a 375 px phone, gets the first by
// polling (no reload) and never the second, and may not post "Workshop only"; the unread badge
// counts and clears once the thread has been on screen; text is text ("<b>" stays four
// characters) with safe links; a photo goes up with progress and shows as a thumbnail; a refused
// file keeps what was typed; the customer sees only "Whole job", and the demo's own conversation
// (tests/factories/demo-thread.ts) keeps to its audiences too. Chromium against the built
// client (production CSP), axe-core on each role's page.
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Locator, Page } from "playwright-core";
import type { ThreadResponse } from "../../shared/schemas";
import { threadAudienceLabels } from "../../shared/schemas";
import { Job } from "../../server/modules/jobs/jobs.entity";
import { postSystemNote } from "../../server/modules/thread/thread-notes";
import { startTestApp, type TestApp } from "../setup/test-app";
import { samplePng, sampleElf } from "../setup/uploads";
import { demoAccounts, demoJobTitles } from "../factories/demo-scenario";
import { demoThreadTexts } from "../factories/demo-thread";
import {
  axeSeriousOrWorse,
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

const signInAs = (email: string, viewport = desktop) =>
  signInPage(browser, t.url!, email, { viewport });

const jobTitle: string = demoJobTitles.alcoves;
const workshopOnly =
  "Price the extra length of coving before we tell anyone else.";
const tradesText =
  "Coving template first thing Thursday; profile at https://example.test/coving/ogee-90. Note <b>bold</b> is only text.";
const tradesLink = "https://example.test/coving/ogee-90";
const wholeJob = "The dust sheets stay down until the decorator has been.";
const systemText = "Kestrel Decorating confirmed Fill, caulk & paint.";
// The demo's own conversation on the job (tests/factories/demo-thread.ts), one per audience.
const demo = {
  job: demoThreadTexts.carcassesUp,
  trades: demoThreadTexts.covingAnswer,
  workshop: demoThreadTexts.fitterShims,
};

/** The job page by its address (what a link in a notice e-mail opens). */
async function openJob(
  page: Page,
  id: string,
  title = jobTitle,
): Promise<void> {
  await page.goto(`${t.url}/jobs/${id}`);
  await visible(page.getByRole("heading", { name: title, level: 1 }));
  await visible(thread(page).getByRole("form", { name: "New message" }));
}

async function jobByTitle(title: string): Promise<Job> {
  return t.db.ds.getRepository(Job).findOneByOrFail({ title });
}

const thread = (page: Page): Locator => page.locator("#job-thread");
const messages = (page: Page): Locator =>
  thread(page).getByRole("log", { name: "Messages" });
const badge = (page: Page): Locator =>
  thread(page).getByTestId("thread-unread");

/** The whole page, and the thread section on its own (easier to look at). */
async function shots(page: Page, name: string): Promise<void> {
  await shot(page, name);
  await thread(page).screenshot({
    path: path.join(screensDir, `${name}-section.png`),
  });
}

/** The thread as the API gives it to the page's own session (a GET never marks anything read). */
async function apiThread(page: Page, jobId: string): Promise<ThreadResponse> {
  return page.evaluate(async (url) => {
    const r = await fetch(url, { headers: { Accept: "application/json" } });
    return r.json();
  }, `/api/jobs/${jobId}/thread`) as Promise<ThreadResponse>;
}

async function post(
  page: Page,
  audienceLabel: string,
  text: string,
  how: "click" | "keys",
): Promise<void> {
  const form = thread(page).getByRole("form", { name: "New message" });
  await form.getByLabel("Who sees it").selectOption({ label: audienceLabel });
  await form.getByLabel("Message").fill(text);
  if (how === "keys") await form.getByLabel("Message").press("Control+Enter");
  else await form.getByRole("button", { name: "Send" }).click();
  // Sent: the composer is cleared and the message is in the list.
  await visible(messages(page).getByText(text, { exact: true }));
  expect(await form.getByLabel("Message").inputValue()).toBe("");
}

describe("the job thread", () => {
  let jobId = "";
  let owner: { page: Page; problems: string[] };
  let trade: { page: Page; problems: string[] };
  const polls: string[] = [];
  let unreadBefore = 0;

  it("the plasterer has the job open on a phone, the thread below the fold", async () => {
    // A note as the bookings service writes one (same writer, same transaction helper), so the
    // plasterer opens the page with one unread.
    const job = await jobByTitle(jobTitle);
    jobId = job.id;
    await t.db.ds.transaction((m) =>
      postSystemNote(m, job, "trades", systemText),
    );
    trade = await signInAs(demoAccounts.trade.email, phone);
    await openJob(trade.page, jobId);
    trade.page.on("request", (r) => {
      if (r.url().includes(`/api/jobs/${jobId}/thread?`)) polls.push(r.url());
    });
    // Marks this document: a reload or navigation would lose it.
    await trade.page.evaluate(() => {
      (window as unknown as { sameDocument: boolean }).sameDocument = true;
    });
    // The premise of the unread check below: the thread is not on screen yet.
    const box = await messages(trade.page)
      .or(thread(trade.page).getByText("No messages yet"))
      .boundingBox();
    expect(box!.y).toBeGreaterThan(phone.height);
    const api = await apiThread(trade.page, jobId);
    unreadBefore = api.unreadCount;
    // The demo has him read up to his own message of yesterday evening: the note alone is new.
    expect(unreadBefore).toBe(1);
    expect(api.messages.filter((m) => m.unread).map((m) => m.text)).toEqual([
      systemText,
    ]);
    expect(api.visibleAudiences).not.toContain("workshop");
    // The demo's conversation: the whole-job and trades messages, never the workshop's own.
    await visible(messages(trade.page).getByText(demo.job, { exact: false }));
    await visible(
      messages(trade.page).getByText(demo.trades, { exact: false }),
    );
    expect(
      await thread(trade.page)
        .getByText(demo.workshop, { exact: false })
        .count(),
    ).toBe(0);
    await expect
      .poll(() => badge(trade.page).textContent(), { timeout: 10_000 })
      .toBe(`${unreadBefore} unread`);
    // The system note: Sitecue's, with no person as author.
    const note = messages(trade.page)
      .getByRole("listitem")
      .filter({ hasText: systemText });
    await visible(note.getByText("Sitecue", { exact: true }));
    await visible(note.getByText("Trades & workshop"));
    expect(await note.getByText(/· (Workshop|Customer)/).count()).toBe(0);
  });

  it("the owner posts a Workshop only and then a Trades & workshop message", async () => {
    owner = await signInAs(demoAccounts.owner.email);
    // Before the job page is open: the demo left her the plasterer's and the fitter's evening
    // messages unread, and the note above is new too.
    expect(
      (await apiThread(owner.page, jobId)).messages
        .filter((m) => m.unread)
        .map((m) => m.text),
    ).toEqual([
      expect.stringContaining(demoThreadTexts.scribeGap),
      expect.stringContaining(demoThreadTexts.fitterShims),
      systemText,
    ]);
    await openJob(owner.page, jobId);
    // She sees every audience of the demo's conversation.
    for (const text of Object.values(demo))
      await visible(messages(owner.page).getByText(text, { exact: false }));
    const select = thread(owner.page).getByLabel("Who sees it");
    expect(await select.locator("option").allTextContents()).toEqual([
      threadAudienceLabels.job,
      threadAudienceLabels.trades,
      threadAudienceLabels.workshop,
    ]);
    await post(owner.page, "Workshop only", workshopOnly, "keys");
    await post(owner.page, "Trades & workshop", tradesText, "click");
    await visible(
      messages(owner.page)
        .getByRole("listitem")
        .filter({ hasText: workshopOnly })
        .getByText("Workshop only"),
    );
    await visible(
      messages(owner.page)
        .getByRole("listitem")
        .filter({ hasText: "Coving template first thing" })
        .getByText(`${demoAccounts.owner.name} · Workshop`),
    );
    await shots(owner.page, "thread-owner-desktop");
  });

  it("the plasterer gets the trades message by polling, never the workshop one", async () => {
    const page = trade.page;
    const arrived = messages(page).getByText("Coving template first thing");
    await arrived.waitFor({ state: "visible", timeout: 15_000 });
    expect(
      await page.evaluate(
        () => (window as unknown as { sameDocument?: boolean }).sameDocument,
      ),
    ).toBe(true);
    // It came with the cursor: a poll asked only for what is after the last position seen.
    expect(polls.some((u) => /[?&]after=\d+/.test(u))).toBe(true);
    // Posted before the trades message, so it would have come with it if it could.
    expect(await thread(page).getByText(workshopOnly).count()).toBe(0);

    // Text is text: the literal tag, no <b> element; the URL is a safe link, its full stop left out.
    await visible(
      thread(page).getByText("Note <b>bold</b> is only text.", {
        exact: false,
      }),
    );
    expect(await thread(page).locator("b").count()).toBe(0);
    const link = thread(page).getByRole("link", { name: tradesLink });
    expect(await link.getAttribute("href")).toBe(tradesLink);
    expect(await link.getAttribute("rel")).toBe("noopener noreferrer");
    expect(await link.getAttribute("target")).toBe("_blank");

    // The badge counts it (the workshop-only one is not theirs to count).
    await expect
      .poll(() => badge(page).textContent(), { timeout: 10_000 })
      .toBe(`${unreadBefore + 1} unread`);
    const api = await apiThread(page, jobId);
    expect(api.unreadCount).toBe(unreadBefore + 1);
    const firstUnread = api.messages.find((m) => m.unread)!;

    // Their composer offers what the server allows them, and never "Workshop only".
    const options = await thread(page)
      .getByLabel("Who sees it")
      .locator("option")
      .allTextContents();
    expect(options).toEqual(api.audiences.map((a) => threadAudienceLabels[a]));
    expect(options).not.toContain("Workshop only");
    expect(options).toContain("Trades & workshop");
    await shots(page, "thread-trade-unread-phone");

    // On screen for a moment: read. The "New" divider sits on the first unread message.
    await messages(page).scrollIntoViewIfNeeded();
    const divided = messages(page)
      .getByRole("listitem")
      .filter({ has: page.getByText("New", { exact: true }) });
    await visible(divided);
    expect(await divided.textContent()).toContain(
      firstUnread.text.slice(0, 30),
    );
    await badge(page).waitFor({ state: "detached", timeout: 10_000 });
    expect((await apiThread(page, jobId)).unreadCount).toBe(0);
    await shots(page, "thread-trade-read-phone");
    expect(await axeSeriousOrWorse(page)).toEqual([]);
  });

  it("a refused file keeps what the plasterer typed; a photo goes up and shows as a thumbnail", async () => {
    const page = trade.page;
    const form = thread(page).getByRole("form", { name: "New message" });
    const typed = "Template photo to follow, and my notes.";
    await form.getByLabel("Who sees it").selectOption({ label: "Whole job" });
    await form.getByLabel("Message").fill(typed);
    // Named .pdf, so it passes the browser's first check; the server reads the bytes.
    await form.getByTestId("thread-file-input").setInputFiles({
      name: "notes.pdf",
      mimeType: "application/pdf",
      buffer: sampleElf(),
    });
    await visible(form.getByText("notes.pdf"));
    await form.getByRole("button", { name: "Send" }).click();
    const refusal = form.getByRole("alert");
    await visible(refusal);
    expect(await refusal.textContent()).toMatch(
      /^notes\.pdf is not a PDF: its content is an ELF executable/,
    );
    expect(await form.getByLabel("Message").inputValue()).toBe(typed);
    expect(await form.getByLabel("Who sees it").inputValue()).toBe("job");
    await shots(page, "thread-trade-refused-phone");

    await form.getByRole("button", { name: "Remove notes.pdf" }).click();
    await form.getByLabel("Who sees it").selectOption({
      label: "Trades & workshop",
    });
    await form.getByLabel("Message").fill("Template photo from site.");
    await form.getByTestId("thread-file-input").setInputFiles({
      name: "coving-template.png",
      mimeType: "image/png",
      buffer: await samplePng(800, 500),
    });
    await form.getByRole("button", { name: "Send" }).click();
    const mine = messages(page)
      .getByRole("listitem")
      .filter({ hasText: "Template photo from site." });
    await visible(mine.getByRole("img", { name: "coving-template.png" }));
    expect(await form.getByRole("alert").count()).toBe(0);
    expect(await form.getByLabel("Message").inputValue()).toBe("");
    expect(trade.problems.filter((p) => !/status of 415/.test(p))).toEqual([]);

    // The owner's page gets it by polling too, thumbnail loaded through the attachment route.
    const theirs = messages(owner.page)
      .getByRole("listitem")
      .filter({ hasText: "Template photo from site." });
    await theirs.waitFor({ state: "visible", timeout: 15_000 });
    await visible(theirs.getByText("Dev Ashby · Ashby Plaster & Coving"));
    const img = theirs.getByRole("img", { name: "coving-template.png" });
    await expect
      .poll(
        () =>
          img.evaluate(
            (el) =>
              (el as HTMLImageElement).complete &&
              (el as HTMLImageElement).naturalWidth,
          ),
        { timeout: 10_000 },
      )
      .toBeGreaterThan(0);
    await shots(owner.page, "thread-owner-photo-desktop");
    const src = await img.getAttribute("src");
    expect(src).toMatch(
      new RegExp(
        `^/api/jobs/${jobId}/thread/attachments/[0-9a-f-]{36}\\?variant=thumbnail$`,
      ),
    );
  });

  it("the owner filters by audience and posts to the whole job", async () => {
    const page = owner.page;
    const filters = thread(page).getByRole("group", {
      name: "Show messages for",
    });
    await filters.getByRole("button", { name: "Workshop only" }).click();
    await visible(messages(page).getByText(workshopOnly));
    expect(
      await messages(page).getByText("Coving template first thing").count(),
    ).toBe(0);
    await shots(page, "thread-owner-filter-desktop");
    await filters.getByRole("button", { name: "All" }).click();
    await visible(messages(page).getByText("Coving template first thing"));
    await post(page, "Whole job", wholeJob, "keys");
    // The whole job page: thread, calendar, bookings and drawings together.
    expect(await axeSeriousOrWorse(page)).toEqual([]);

    // The bookcase job, still under survey, has no messages yet (its API says so first).
    const otherId = (await jobByTitle(demoJobTitles.bookcase)).id;
    await openJob(page, otherId, demoJobTitles.bookcase);
    expect((await apiThread(page, otherId)).messages).toEqual([]);
    await visible(thread(page).getByText("No messages yet"));
    await thread(page).screenshot({
      path: path.join(screensDir, "thread-empty-desktop-section.png"),
    });
    expect(owner.problems).toEqual([]);
  });

  it("the customer sees the whole-job message only and posts to the whole job", async () => {
    const { page, problems } = await signInAs(
      demoAccounts.customer.email,
      phone,
    );
    await openJob(page, jobId);
    await visible(messages(page).getByText(wholeJob));
    expect(await thread(page).getByText(workshopOnly).count()).toBe(0);
    // The demo's conversation: her own job's messages only.
    await visible(messages(page).getByText(demo.job, { exact: false }));
    await visible(
      messages(page).getByText(demoThreadTexts.customerReply, { exact: false }),
    );
    for (const text of [demo.trades, demo.workshop])
      expect(await thread(page).getByText(text, { exact: false }).count()).toBe(
        0,
      );
    expect(
      await thread(page).getByText("Coving template first thing").count(),
    ).toBe(0);
    expect(
      await thread(page).getByText("Template photo from site.").count(),
    ).toBe(0);
    // One audience: no filter and no choice, just who will read it.
    expect(
      await thread(page)
        .getByRole("group", { name: "Show messages for" })
        .count(),
    ).toBe(0);
    expect(await thread(page).getByLabel("Who sees it").count()).toBe(0);
    await visible(thread(page).getByText("To: Whole job."));
    const api = await apiThread(page, jobId);
    expect(api.audiences).toEqual(["job"]);
    expect(api.messages.every((m) => m.audience === "job")).toBe(true);

    await messages(page).scrollIntoViewIfNeeded();
    const form = thread(page).getByRole("form", { name: "New message" });
    await form
      .getByLabel("Message")
      .fill("Thank you, the cat will be upstairs.");
    await form.getByRole("button", { name: "Send" }).click();
    await visible(
      messages(page)
        .getByRole("listitem")
        .filter({ hasText: "the cat will be upstairs" })
        .getByText(`${demoAccounts.customer.name} · Customer`),
    );
    // They have read the whole-job message now: no badge left.
    await badge(page).waitFor({ state: "detached", timeout: 10_000 });
    await shots(page, "thread-customer-phone");
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    expect(problems).toEqual([]);
  });
});
