// A failed e-mail on the maker's home: an invitation the mail server refused (a permanent 550 from
// the SMTP fake) shows on the attention list as a plain sentence with "Send again"; one click puts
// it back in the queue, the item goes, and the same message (same Message-ID) reaches the fake.
// Chromium against the built client (production CSP), axe-core on the page.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import {
  signIn as apiSignIn,
  startTestApp,
  type TestApp,
} from "../setup/test-app";
import { DEMO_WORKSHOP_NAME, demoAccounts } from "../factories/demo-scenario";
import { OutboxMessage } from "../../server/infra/outbox/outbox.entity";
import { Workshop } from "../../server/modules/workshops/workshops.entity";
import { axeSeriousOrWorse, launchBrowser, shot, signInPage } from "./browser";

let t: TestApp;
let browser: Browser;
let failed: OutboxMessage;
const to = "nell.plaster@example.test";

beforeAll(async () => {
  t = await startTestApp({ demo: true, listen: true });
  browser = await launchBrowser();
  const owner = await apiSignIn(t, demoAccounts.owner.email);
  const workshop = await t.db.ds.manager.findOneByOrFail(Workshop, {
    name: DEMO_WORKSHOP_NAME,
  });
  t.mail.refuse(to);
  await owner.agent
    .post(`/api/workshops/${workshop.id}/invitations`)
    .set("X-CSRF-Token", owner.csrf)
    .send({ role: "fitter", name: "Nell Plaster", email: to })
    .expect(201);
  const repo = t.db.ds.getRepository(OutboxMessage);
  const deadline = Date.now() + 10_000;
  for (;;) {
    const row = await repo.findOneBy({ to, state: "failed" });
    if (row) {
      failed = row;
      break;
    }
    if (Date.now() > deadline) throw new Error("The invitation never failed");
    await new Promise((r) => setTimeout(r, 50));
  }
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await t?.close();
});

describe("the owner's home: an e-mail that could not be sent", () => {
  it("reads as a sentence with “Send again”; one click sends it and the item goes", async () => {
    const { page, problems } = await signInPage(
      browser,
      t.url!,
      demoAccounts.owner.email,
    );
    const list = page.getByRole("list", { name: "Needs you now" });
    await list.waitFor({ timeout: 15_000 });
    const item = list
      .getByRole("listitem")
      .filter({ hasText: `The e-mail to ${to}` });
    await item.waitFor();
    expect(await item.getByText("E-mail not sent").count()).toBe(1);
    await expect(item.innerText()).resolves.toMatch(
      /The e-mail to nell\.plaster@example\.test about “Hollin & Vane Joinery invites you to Sitecue” could not be sent \(last tried \w{3} \d{1,2} \w{3} at \d{2}:\d{2}\): the mail server refused it \(550 .*\)\./,
    );
    // An action done here, not a place to go: a button, not a link.
    const send = item.getByRole("button", { name: "Send again" });
    expect(await send.count()).toBe(1);
    expect(await item.getByRole("link").count()).toBe(0);
    await shot(page, "failed-mail-01-on-the-list");
    expect(await axeSeriousOrWorse(page)).toEqual([]);

    // The address works again (the recipient fixed their mailbox); the maker sends it again.
    t.mail.accept(to);
    await send.click();
    await page
      .getByRole("status")
      .filter({
        hasText: `The e-mail to ${to} is back in the queue and will be sent again in a moment.`,
      })
      .waitFor();
    await item.waitFor({ state: "detached" });
    const caught = await t.mail.waitFor((m) => m.to.includes(to));
    expect(caught.messageId).toBe(failed.messageId);
    await shot(page, "failed-mail-02-sent-again");
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    expect(problems).toEqual([]);
  });
});
