// Issue 14, "Done when": a new workshop starts on Sitecue by itself, end to end in the browser —
// sign up from the sign-in page, confirm the address from the e-mail the SMTP fake caught, go
// through the set-up, bring in three trades from a vCard file (RFC 6350 / RFC 2426, the way a
// phone exports contacts) and two customers from a CSV (RFC 4180) with a bad row refused with its
// reason, start a job from a starter and book one of the imported trades. Desktop and 375 px,
// axe on every screen, and the trade's invitation e-mail names the new workshop.
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

/** Three cards as a phone writes them: 3.0 and 4.0, one with a folded line. */
const vcf = (tag: string) =>
  [
    "BEGIN:VCARD",
    "VERSION:3.0",
    "N:Marle;Juno;;;",
    "FN:Juno Marle",
    `ORG:Lathe & Lime Plastering ${tag}`,
    "TEL;TYPE=CELL:07700 900511",
    `EMAIL;TYPE=INTERNET:juno.${tag}@lathelime.example.test`,
    "END:VCARD",
    "BEGIN:VCARD",
    "VERSION:4.0",
    "FN:Rafe Olund",
    `ORG:Brightwire Electrical ${tag}`,
    "TEL;VALUE=uri;TYPE=work:tel:+44-7700-900512",
    `EMAIL:rafe.${tag}@brightwire.example.test`,
    "NOTE:Part P registered; first and second fix, ",
    " consumer units.",
    "END:VCARD",
    "BEGIN:VCARD",
    "VERSION:3.0",
    "N:Quill;Tamsin;;;",
    `ORG:Oakleaf Decorating ${tag}`,
    "TEL:07700 900513",
    `EMAIL:tamsin.${tag}@oakleaf.example.test`,
    "END:VCARD",
    "",
  ].join("\r\n");

/** Two good customers and one whose e-mail is not an address. */
const csv = (tag: string) =>
  [
    "Name,E-mail,Phone",
    `Hester Vale,hester.${tag}@example.test,07700 900521`,
    `Osric Penn,osric.${tag}@example.test,`,
    `Wyn Farr,wyn at example,07700 900523`,
    "",
  ].join("\r\n");

describe.each([
  ["desktop", desktop],
  ["phone", phone],
] as const)("a new workshop's first half hour (%s)", (name, viewport) => {
  let page: Page;
  let problems: string[];
  const email = `maker.${name}@brindlewood.example.test`;
  const workshopName = `Brindlewood Joinery (${name})`;
  const plasterer = `Lathe & Lime Plastering ${name}`;
  const step = async (what: string) => {
    expect(await axeSeriousOrWorse(page), what).toEqual([]);
    await shot(page, `first-workshop-${name}-${what}`);
  };

  it("signs up from the sign-in page and confirms the address from the e-mail", async () => {
    const context = await browser.newContext({ viewport });
    page = await context.newPage();
    problems = watchConsole(page);
    await page.goto(`${t.url}/sign-in`);
    await page.getByRole("link", { name: "Create your workshop" }).click();
    await page.getByLabel("Workshop name").fill(workshopName);
    await page.getByLabel("Your name").fill("Morwen Brindle");
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill("quarter-sawn-oak-7");
    await step("01-sign-up");
    await page.getByRole("button", { name: "Create your workshop" }).click();
    await page.waitForURL(/\/setup$/);
    await visible(
      page.getByRole("heading", { name: "Step 1 of 3: Nation and time zone" }),
    );
    await visible(
      page.getByRole("region", { name: "Confirm your e-mail address" }),
    );

    const mail = await t.mail.waitFor(
      (m) =>
        m.to.includes(email) &&
        m.subject === "Confirm your e-mail address for Sitecue",
    );
    const link = mail.links.find((l) => l.includes("/verify/"))!;
    await page.goto(link);
    await visible(page.getByText("Your e-mail address is confirmed"));
    await step("02-confirmed");
    const me = await apiGet<{
      user: {
        emailVerified: boolean;
        memberships: { workshopName: string; role: string }[];
      };
    }>(page, "/api/auth/session");
    expect(me.user.emailVerified).toBe(true);
    expect(me.user.memberships).toEqual([
      expect.objectContaining({ workshopName, role: "owner" }),
    ]);
  });

  it("goes through the set-up: Scotland, a four-day week, no set-time arrivals", async () => {
    await page.goto(`${t.url}/setup`);
    await page
      .getByLabel("Nation", { exact: true })
      .selectOption({ label: "Scotland" });
    await step("03-setup-nation");
    await page.getByRole("button", { name: "Save and continue" }).click();
    await visible(
      page.getByRole("heading", {
        name: "Step 2 of 3: Working days and hours",
      }),
    );
    await page
      .getByRole("group", { name: "Days the workshop works" })
      .getByRole("checkbox", { name: "Fri" })
      .uncheck();
    await step("04-setup-days");
    await page.getByRole("button", { name: "Save and continue" }).click();
    await visible(
      page.getByRole("heading", {
        name: "Step 3 of 3: Arrival times and reminders",
      }),
    );
    await page.getByRole("checkbox", { name: "Between set times" }).uncheck();
    await page.getByRole("button", { name: "Save and continue" }).click();
    await visible(page.getByRole("heading", { name: "Next steps" }));
    await step("05-next-steps");

    const workshopId = (
      await apiGet<{ user: { memberships: { workshopId: string }[] } }>(
        page,
        "/api/auth/session",
      )
    ).user.memberships[0].workshopId;
    const saved = await apiGet<{
      holidayRegion: string;
      workingWeekdays: number[];
      arrivalWindows: string[];
    }>(page, `/api/workshops/${workshopId}`);
    expect(saved.holidayRegion).toBe("GB-SCT");
    expect(saved.workingWeekdays).toEqual([1, 2, 3, 4]);
    expect(saved.arrivalWindows).not.toContain("range");
  });

  it("imports three trades from a vCard file, choosing each one's trade", async () => {
    await page.getByRole("link", { name: "Add your trades" }).click();
    await page.waitForURL(/\/trades$/);
    await page
      .getByRole("button", { name: "Import contacts (vCard or CSV)" })
      .click();
    await page.getByLabel("Contacts file").setInputFiles({
      name: "phone-contacts.vcf",
      mimeType: "text/vcard",
      buffer: Buffer.from(vcf(name)),
    });
    const rows = page.getByRole("list", { name: "Rows in the file" });
    await visible(rows);
    await visible(rows.getByText(plasterer));
    for (const [row, kind] of [
      [1, "plasterer"],
      [2, "electrician"],
      [3, "decorator"],
    ] as const)
      await rows.getByLabel(`Trade for row ${row}`).selectOption(kind);
    await step("06-trades-preview");
    // Nothing is kept until the owner confirms.
    const before = await apiGet<{ trades: unknown[] }>(
      page,
      `/api/workshops/${await workshopIdOf(page)}/trades`,
    );
    expect(before.trades).toEqual([]);
    await page.getByRole("button", { name: "Add 3 ticked rows" }).click();
    await visible(page.getByText("3 trades added."));
    await visible(page.getByText(`Oakleaf Decorating ${name}`));
    await visible(page.getByText(`Brightwire Electrical ${name}`));
    await step("07-trades-added");
    const after = await apiGet<{
      trades: { businessName: string; kind: string; phone: string }[];
    }>(page, `/api/workshops/${await workshopIdOf(page)}/trades`);
    expect(after.trades.map((x) => [x.businessName, x.kind]).sort()).toEqual(
      [
        [`Brightwire Electrical ${name}`, "electrician"],
        [plasterer, "plasterer"],
        [`Oakleaf Decorating ${name}`, "decorator"],
      ].sort(),
    );
  });

  it("imports two customers from a CSV; the bad row is refused with its reason", async () => {
    await page
      .getByRole("navigation", { name: "Main" })
      .getByRole("link", { name: "Customers" })
      .click();
    await page.getByRole("button", { name: "Import customers (CSV)" }).click();
    await page.getByLabel("Contacts file").setInputFiles({
      name: "customers.csv",
      mimeType: "text/csv",
      buffer: Buffer.from(csv(name)),
    });
    const rows = page.getByRole("list", { name: "Rows in the file" });
    await visible(
      rows.getByText("Row 3: E-mail: Enter a valid e-mail address"),
    );
    expect(await rows.getByLabel("Row 3: Wyn Farr").isDisabled()).toBe(true);
    await step("08-customers-preview");
    await page.getByRole("button", { name: "Add 2 ticked rows" }).click();
    await visible(page.getByText("2 customers added."));
    const list = page.getByRole("list", { name: "Customers" });
    await visible(list.getByText("Hester Vale"));
    await visible(list.getByText("Osric Penn"));
    expect(await list.getByText("Wyn Farr").count()).toBe(0);
    await step("09-customers-added");
  });

  it("starts a job from a starter and books the imported plasterer", async () => {
    await page
      .getByRole("navigation", { name: "Main" })
      .getByRole("link", { name: "Jobs" })
      .click();
    await visible(page.getByText("No jobs yet"));
    await step("10-empty-home");
    await page
      .getByRole("button", { name: "Start a job from a starter" })
      .click();
    await visible(page.getByRole("heading", { name: "New job" }));
    const title = "Alcove cabinets, snug";
    await page.getByLabel("Title").fill(title);
    await page
      .getByLabel("Customer")
      .selectOption({ label: `Hester Vale (hester.${name}@example.test)` });
    await page.getByLabel("Site address").fill("4 Tanner Row, Ettlesby");
    await page.getByLabel("Postcode").fill("QX9 4TR");
    await page.getByLabel("Area", { exact: true }).fill("Tanner Row, Ettlesby");
    await page
      .getByLabel("Start from")
      .selectOption({ label: "Alcove cabinets (pair)" });
    await step("11-new-job");
    await page.getByRole("button", { name: "Create job" }).click();
    await visible(page.getByRole("heading", { name: title }));

    await page.getByRole("link", { name: "Plan the programme" }).click();
    const coving = page
      .getByRole("list", { name: "Tasks" })
      .getByRole("listitem")
      .filter({
        has: page.getByRole("heading", {
          name: "Template coving",
          exact: true,
        }),
      });
    await coving
      .getByRole("button", { name: "Book a plasterer for Template coving" })
      .click();
    const panel = page.getByRole("form", {
      name: "Book a plasterer for Template coving",
    });
    await visible(panel);
    // The set-up took "between set times" off: the panel does not offer it.
    expect(
      await countOf(panel.getByRole("radio", { name: "Between set times" })),
    ).toBe(0);
    await panel.locator("label").filter({ hasText: plasterer }).click();
    await step("12-booking-panel");
    await panel.getByRole("button", { name: `Send to ${plasterer}` }).click();
    await visible(
      page.getByText(new RegExp(`^Sent to ${escape(plasterer)} for `)),
    );
    await visible(coving.getByText("Sent", { exact: true }));
    await step("13-booked");

    // The trade's invitation comes from the new workshop, with its confirm-by-link page.
    const invitation = await t.mail.waitFor((m) =>
      m.to.includes(`juno.${name}@lathelime.example.test`),
    );
    expect(invitation.text).toContain(workshopName);
    expect(invitation.links.some((l) => l.includes("/b/"))).toBe(true);
    // Only the refusals this walk asks for: none.
    expect(problems).toEqual([]);
    await page.context().close();
  });
});

const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

async function workshopIdOf(page: Page): Promise<string> {
  const me = await apiGet<{
    user: { memberships: { workshopId: string }[] };
  }>(page, "/api/auth/session");
  return me.user.memberships[0].workshopId;
}
