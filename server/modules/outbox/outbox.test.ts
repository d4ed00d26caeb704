// A failed e-mail surfaced to the workshop (the attention list) and sent again from there, against
// real MariaDB and the SMTP fake: the fake refuses the address with a permanent 550 (RFC 5321
// §4.2.2), the worker gives up, the owner sees it and re-queues it, and the same message
// (same Message-ID) then reaches the fake.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../../tests/setup/test-app";
import {
  buildFailedMail,
  buildMember,
  buildUser,
  buildWorkshop,
} from "../../../tests/factories/builders";
import {
  DEMO_PASSWORD,
  demoAccounts,
  DEMO_WORKSHOP_NAME,
} from "../../../tests/factories/demo-scenario";
import type { AttentionResponse } from "../../../shared/schemas";
import { OutboxMessage } from "../../infra/outbox/outbox.entity";
import { Workshop } from "../workshops/workshops.entity";
import { shortReason } from "./outbox.service";

let t: TestApp;
let owner: Session;
let fitter: Session;
let stranger: Session;
let workshopId: string;
let otherWorkshopId: string;

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  const m = t.db.ds.manager;
  workshopId = (await m.findOneByOrFail(Workshop, { name: DEMO_WORKSHOP_NAME }))
    .id;
  // Another workshop with its own owner, who must see none of this one's e-mail.
  const other = await buildWorkshop(m, { name: "Wetherfold Kitchens" });
  otherWorkshopId = other.id;
  const otherOwner = await buildUser(m, {
    email: "owner@wetherfold-kitchens.example.test",
    password: DEMO_PASSWORD,
  });
  await buildMember(m, other, otherOwner, "owner");
  owner = await signIn(t, demoAccounts.owner.email);
  fitter = await signIn(t, demoAccounts.fitter.email);
  stranger = await signIn(t, "owner@wetherfold-kitchens.example.test");
}, 120_000);
afterAll(async () => t?.close());

const attention = async (
  who: Session,
  ws = workshopId,
): Promise<AttentionResponse> =>
  (await who.agent.get(`/api/workshops/${ws}/attention`).expect(200)).body;
const retry = (who: Session, id: string, ws = workshopId) =>
  who.agent
    .post(`/api/workshops/${ws}/outbox/${id}/retry`)
    .set("X-CSRF-Token", who.csrf);
const row = (id: string) =>
  t.db.ds.getRepository(OutboxMessage).findOneByOrFail({ id });

/** Polls until `check` passes, or fails after `ms`. */
async function until(check: () => Promise<boolean>, ms = 10_000) {
  const deadline = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error("Condition not met in time");
    await new Promise((r) => setTimeout(r, 50));
  }
}

describe("a failed e-mail on the attention list, sent again", () => {
  it("an invitation the mail server refuses ends failed, shows for the workshop (not another), and is delivered with its Message-ID once sent again", async () => {
    const to = "plaster.new@example.test";
    t.mail.refuse(to);
    await owner.agent
      .post(`/api/workshops/${workshopId}/invitations`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ role: "fitter", name: "Nell Plaster", email: to })
      .expect(201);
    const repo = t.db.ds.getRepository(OutboxMessage);
    let queued: OutboxMessage | null = null;
    await until(async () => {
      queued = await repo.findOneBy({ to, state: "failed" });
      return queued !== null;
    });
    const failed = queued!;
    // A permanent 550 is not retried for hours: one attempt, then failed.
    expect(failed.attempts).toBe(1);
    expect(failed.workshopId).toBe(workshopId);
    expect(failed.lastError).toContain("550");
    expect(t.mail.messages().filter((m) => m.to.includes(to))).toHaveLength(0);

    const item = (await attention(owner)).items.find(
      (i) => i.id === `mail-failed:${failed.id}`,
    );
    expect(item).toMatchObject({
      kind: "mail-failed",
      tone: "risk",
      job: null,
      action: { label: "Send again", retryMessageId: failed.id },
    });
    expect(item!.sentence).toMatch(
      new RegExp(
        `^The e-mail to plaster\\.new@example\\.test about “Hollin & Vane Joinery invites you to Sitecue” could not be sent \\(last tried \\w{3} \\d{1,2} \\w{3} at \\d{2}:\\d{2}\\): the mail server refused it \\(550 .*mailbox unavailable\\)\\.$`,
      ),
    );
    // The wait reads from the last attempt.
    expect(item!.since).toBe(failed.lastAttemptAt!.toISOString());
    // The fitter sees it too; the other workshop's owner sees nothing of it.
    expect(
      (await attention(fitter)).items.some((i) => i.kind === "mail-failed"),
    ).toBe(true);
    const theirs = await attention(stranger, otherWorkshopId);
    expect(theirs.items.some((i) => i.kind === "mail-failed")).toBe(false);
    expect(JSON.stringify(theirs)).not.toContain(to);

    // Sent again once the address works: same row, same Message-ID, delivered to the fake.
    t.mail.accept(to);
    const res = await retry(owner, failed.id).expect(200);
    expect(res.body).toEqual({
      id: failed.id,
      messageId: failed.messageId,
      to,
      state: "pending",
    });
    const caught = await t.mail.waitFor((m) => m.to.includes(to));
    expect(caught.messageId).toBe(failed.messageId);
    expect(caught.subject).toBe("Hollin & Vane Joinery invites you to Sitecue");
    await until(async () => (await row(failed.id)).state === "sent");
    expect(await row(failed.id)).toMatchObject({
      attempts: 0,
      messageId: failed.messageId,
    });
    expect(
      (await attention(owner)).items.some(
        (i) => i.id === `mail-failed:${failed.id}`,
      ),
    ).toBe(false);
    // Once sent there is nothing to send again.
    const again = await retry(owner, failed.id).expect(409);
    expect(again.body.error).toEqual({
      code: "conflict",
      message: "That e-mail has been sent; there is nothing to send again.",
    });
  });

  it("a trade or the customer gets 403, another workshop's owner 404, and the row stays failed", async () => {
    const mail = await buildFailedMail(t.db.ds.manager, workshopId);
    const trade = await signIn(t, demoAccounts.trade.email);
    const customer = await signIn(t, demoAccounts.customer.email);
    for (const who of [trade, customer]) {
      const res = await retry(who, mail.id).expect(403);
      expect(res.body.error.code).toBe("forbidden");
    }
    // Not a member of this workshop: it does not exist for them…
    expect((await retry(stranger, mail.id).expect(404)).body.error.code).toBe(
      "not-found",
    );
    // …nor through their own workshop's path.
    const viaTheirs = await retry(stranger, mail.id, otherWorkshopId).expect(
      404,
    );
    expect(viaTheirs.body.error.message).toBe("That e-mail was not found.");
    expect((await row(mail.id)).state).toBe("failed");
    // An id that is not one is "not found", as for every route's path (server/http/validate.ts).
    const bad = await retry(owner, "not-an-id").expect(404);
    expect(bad.body.error.code).toBe("not-found");
    // The fitter may: it goes back in the queue.
    await retry(fitter, mail.id).expect(200);
    await until(async () => (await row(mail.id)).state !== "failed");
  });

  it("words the reasons the worker records", () => {
    expect(
      shortReason(
        "Can't send mail - all recipients were rejected: 550 5.1.1 <x@example.test>: Recipient address rejected",
      ),
    ).toBe(
      "the mail server refused it (550 5.1.1 <x@example.test>: Recipient address rejected)",
    );
    expect(shortReason("Data command failed: 451 4.3.0 Try again later")).toBe(
      "the mail server turned it away (451 4.3.0 Try again later)",
    );
    expect(shortReason("connect ECONNREFUSED 127.0.0.1:2525")).toBe(
      "Sitecue could not reach its mail server",
    );
    expect(
      shortReason(
        "Claim by host:1:abc expired before it was marked sent (it may have been delivered)",
      ),
    ).toBe("sending stopped part-way, so it may have arrived after all");
    expect(shortReason(null)).toBe("no reason was recorded");
    expect(shortReason("x".repeat(300))).toHaveLength(160);
  });
});
