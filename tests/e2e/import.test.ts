// Issue 14 in the browser: the owner brings three trades in from a phone's vCard export (choosing
// a kind where Sitecue could not guess one) and two customers from a CSV whose bad row is refused
// with its reason; edits a trade; changes a draft booking. Desktop and 375 px, axe on each screen.
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import type {
  BookingOptionsResponse,
  BookingResponse,
  CustomerResponse,
  ProgrammeResponse,
  TradeResponse,
} from "../../shared/schemas";
import {
  signIn as apiSignIn,
  startTestApp,
  type TestApp,
} from "../setup/test-app";
import { createJobFromStarter } from "../setup/jobs";
import { demoAccounts, demoJobTitles } from "../factories/demo-scenario";
import { Job } from "../../server/modules/jobs/jobs.entity";
import {
  apiGet,
  axeSeriousOrWorse,
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

// Three trades as a phone exports them: vCard 3.0 and 4.0 cards in one file; the third card says
// nothing about its trade, so the owner chooses it.
const CONTACTS_VCF = [
  "BEGIN:VCARD",
  "VERSION:3.0",
  "FN:Ivy Render",
  "ORG:Render & Skim Ltd",
  "TEL;TYPE=CELL:07700 900101",
  "EMAIL;TYPE=INTERNET:ivy@renderskim.example.test",
  "CATEGORIES:Plastering",
  "END:VCARD",
  "BEGIN:VCARD",
  "VERSION:4.0",
  "FN:Wes Watts",
  "ORG:Watts Electrical",
  "TITLE:Electrician",
  "TEL;VALUE=uri;TYPE=work:tel:+44-7700-900102",
  "EMAIL:wes@watts.example.test",
  "END:VCARD",
  "BEGIN:VCARD",
  "VERSION:3.0",
  "N:Hue;Penny;;;",
  "ORG:Penny Hue & Daughters",
  "TEL:07700 900103",
  "EMAIL:penny@hue.example.test",
  "END:VCARD",
  "",
].join("\r\n");
const CUSTOMERS_CSV = fs.readFileSync(
  path.resolve(import.meta.dirname, "../fixtures/contacts/customers.csv"),
);

/** Elements reaching past the right edge of the screen (none at 375 px). */
const overflowing = (page: Page) =>
  page.evaluate(() =>
    [...document.querySelectorAll("body *")]
      .filter((e) => e.getBoundingClientRect().right > window.innerWidth + 1)
      .slice(0, 5)
      .map((e) => `${e.tagName} ${e.textContent?.slice(0, 40)}`),
  );

async function importTrades(page: Page, found: string) {
  await page.goto(`${t.url}/trades`);
  await page
    .getByRole("button", { name: "Import contacts (vCard or CSV)" })
    .click();
  await page.getByLabel("Contacts file").setInputFiles({
    name: "contacts.vcf",
    mimeType: "text/vcard",
    buffer: Buffer.from(CONTACTS_VCF),
  });
  const rows = page.getByRole("list", { name: "Rows in the file" });
  await visible(rows);
  await visible(page.getByText(found));
  return rows;
}

describe("bringing trades and customers in (desktop)", () => {
  let page: Page;
  let problems: string[];

  it("imports three trades from a vCard file, the third's kind chosen by the owner", async () => {
    ({ page, problems } = await signInPage(
      browser,
      t.url!,
      demoAccounts.owner.email,
    ));
    const rows = await importTrades(page, "3 rows found, 3 ticked to add.");
    // Sitecue's guesses from the cards, each a labelled select.
    expect(await rows.getByLabel("Trade for row 1").inputValue()).toBe(
      "plasterer",
    );
    expect(await rows.getByLabel("Trade for row 2").inputValue()).toBe(
      "electrician",
    );
    expect(await rows.getByLabel("Trade for row 3").inputValue()).toBe("");
    await rows.getByLabel("Trade for row 3").selectOption("decorator");
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    await shot(page, "import-trades-preview-desktop");
    // Nothing is saved by the preview.
    const before = await apiGet<{ trades: TradeResponse[] }>(
      page,
      `/api/workshops/${(await t.db.ds.manager.findOneByOrFail(Job, { title: demoJobTitles.alcoves })).workshopId}/trades`,
    );
    expect(
      before.trades.some((x) => x.businessName === "Watts Electrical"),
    ).toBe(false);

    await page.getByRole("button", { name: "Add 3 ticked rows" }).click();
    await visible(page.getByText("3 trades added."));
    const list = page.getByRole("listitem").filter({
      hasText: "Penny Hue & Daughters",
    });
    await visible(list.getByText("Decorator"));
    await visible(page.getByText("Watts Electrical"));
    await visible(page.getByText("Render & Skim Ltd"));
    await shot(page, "import-trades-added-desktop");
  }, 60_000);

  it("edits a trade in a prefilled form", async () => {
    await page.getByRole("button", { name: "Edit Watts Electrical" }).click();
    const form = page.getByRole("form", { name: "Edit Watts Electrical" });
    await visible(form);
    expect(await form.getByLabel("E-mail").inputValue()).toBe(
      "wes@watts.example.test",
    );
    await form.getByLabel("Phone").fill("call me");
    await form.getByRole("button", { name: "Save changes" }).click();
    await visible(form.getByText("Use digits, spaces, + ( ) or -"));
    await form.getByLabel("Phone").fill("01632 960 777");
    await form.getByLabel("Trade").selectOption("electrician");
    await form.getByRole("button", { name: "Save changes" }).click();
    await visible(page.getByRole("status").filter({ hasText: "Saved." }));
    await visible(page.getByRole("link", { name: "01632 960 777" }));
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    await shot(page, "edit-trade-desktop");
  }, 60_000);

  it("imports two customers from a CSV; the bad row is refused with its reason, the duplicate left unticked", async () => {
    await page.getByRole("link", { name: "Customers" }).click();
    await visible(page.getByRole("heading", { name: "Customers" }));
    await page.getByRole("button", { name: "Import customers (CSV)" }).click();
    await page.getByLabel("Contacts file").setInputFiles({
      name: "customers.csv",
      mimeType: "text/csv",
      buffer: CUSTOMERS_CSV,
    });
    const rows = page.getByRole("list", { name: "Rows in the file" });
    await visible(rows);
    await visible(page.getByText("4 rows found, 2 ticked to add."));
    await visible(
      rows.getByText("Row 3: E-mail: Enter a valid e-mail address"),
    );
    expect(await rows.getByLabel("Row 3: Nell Ortiz").isDisabled()).toBe(true);
    expect(await rows.getByLabel("Row 4: Ada Linwood").isChecked()).toBe(false);
    await visible(
      rows.getByText(
        "Same e-mail as Ada Linwood (already one of your customers). Tick it to add it anyway.",
      ),
    );
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    await shot(page, "import-customers-preview-desktop");
    await page.getByRole("button", { name: "Add 2 ticked rows" }).click();
    await visible(page.getByText("2 customers added."));
    const customers = page.getByRole("list", { name: "Customers" });
    await visible(customers.getByText("Iris Calloway"));
    await visible(customers.getByText("Bram Okafor"));
    expect(await customers.getByText("Nell Ortiz").count()).toBe(0);
    await shot(page, "import-customers-added-desktop");
  }, 60_000);

  it("changes a draft booking's arrival window", async () => {
    // The draft is made through the API as the booking panel makes one (send: false).
    const owner = await apiSignIn(t, demoAccounts.owner.email);
    const alcoves = await t.db.ds.manager.findOneByOrFail(Job, {
      title: demoJobTitles.alcoves,
    });
    const jobId = await createJobFromStarter(owner, {
      workshopId: alcoves.workshopId,
      customerId: alcoves.customerId,
      title: "Alcove cabinets, back room",
    });
    const p: ProgrammeResponse = (
      await owner.agent.get(`/api/jobs/${jobId}/programme`).expect(200)
    ).body;
    const task = p.tasks.find((x) => x.name === "Template coving")!;
    const options: BookingOptionsResponse = (
      await owner.agent
        .get(`/api/jobs/${jobId}/tasks/${task.id}/booking-options`)
        .expect(200)
    ).body;
    const ashby = options.trades.find(
      (x) => x.businessName === "Ashby Plaster & Coving",
    )!;
    const draft: BookingResponse = (
      await owner.agent
        .post(`/api/jobs/${jobId}/bookings`)
        .set("X-CSRF-Token", owner.csrf)
        .send({
          taskId: task.id,
          tradeId: ashby.tradeId,
          start: ashby.firstFree!.start,
          arrivalWindow: "morning",
          send: false,
        })
        .expect(201)
    ).body;

    await page.goto(`${t.url}/jobs/${jobId}`);
    const item = page
      .getByRole("list", { name: "Bookings" })
      .getByRole("listitem", {
        name: "Ashby Plaster & Coving, Template coving",
      });
    await item
      .getByRole("button", { name: "Change the draft for Template coving" })
      .click();
    const form = page.getByRole("form", {
      name: "Change the draft booking for Template coving",
    });
    await visible(form);
    // Prefilled from the draft.
    expect(await form.getByLabel("Start").inputValue()).toBe(
      draft.start.slice(0, 10),
    );
    await form.getByRole("radio", { name: "All day" }).check();
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    await shot(page, "edit-draft-booking-desktop");
    await form.getByRole("button", { name: "Save the draft" }).click();
    await visible(
      page.getByText(/^The draft is changed: Ashby Plaster & Coving for /),
    );
    const after = await apiGet<{ bookings: BookingResponse[] }>(
      page,
      `/api/jobs/${jobId}/bookings`,
    );
    const b = after.bookings.find((x) => x.id === draft.id)!;
    expect(b.state).toBe("draft");
    expect(b.arrivalWindow).toBe("all-day");
    expect(b.history.at(-1)!.note).toMatch(/^Draft changed/);
    expect(problems).toEqual([]);
  }, 90_000);
});

describe("bringing trades and customers in (375 px phone)", () => {
  it("shows the preview rows as cards that fit the screen, each kind a labelled select", async () => {
    const { page, problems } = await signInPage(
      browser,
      t.url!,
      demoAccounts.owner.email,
      { viewport: phone },
    );
    const rows = await importTrades(page, "3 rows found, 0 ticked to add.");
    // Imported on the desktop already: the same file now shows them as kept.
    await visible(
      rows
        .getByText(
          "Same e-mail and phone as Render & Skim Ltd (already one of your trades). Tick it to add it anyway.",
        )
        .first(),
    );
    await visible(rows.getByLabel("Trade for row 2"));
    await shot(page, "import-trades-preview-phone");
    expect(await overflowing(page)).toEqual([]);
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    await page.getByRole("button", { name: "Cancel" }).click();

    await page.goto(`${t.url}/customers`);
    await page.getByRole("button", { name: "Import customers (CSV)" }).click();
    await page.getByLabel("Contacts file").setInputFiles({
      name: "customers.csv",
      mimeType: "text/csv",
      buffer: CUSTOMERS_CSV,
    });
    await visible(
      page.getByText("Row 3: E-mail: Enter a valid e-mail address"),
    );
    expect(await overflowing(page)).toEqual([]);
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    await shot(page, "import-customers-preview-phone");
    const customers = await apiGet<{ customers: CustomerResponse[] }>(
      page,
      `/api/workshops/${(await t.db.ds.manager.findOneByOrFail(Job, { title: demoJobTitles.alcoves })).workshopId}/customers`,
    );
    expect(customers.customers.some((c) => c.name === "Iris Calloway")).toBe(
      true,
    );
    expect(problems).toEqual([]);
  }, 60_000);
});
