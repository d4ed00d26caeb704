// The inbound SMTP receiver, spoken to over real SMTP by nodemailer the way Sitecue's own outbound
// mail (and a calendar app's iMIP reply, RFC 6047) arrives.
import { afterEach, describe, expect, it } from "vitest";
import nodemailer, { type SendMailOptions } from "nodemailer";
import {
  startInboundSmtp,
  inboundSizeLimit,
  type InboundMail,
} from "./inbound";
import {
  buildItipReply,
  parseItipReply,
} from "../../modules/bookings/itip-reply";

const UID = "3f2b8c1e-7d4a-4e9b-b2c6-5a1d0e9f8c7b";
const REPLY_TO = "booking-3f2b8c1e@reply.hollinvane.example.test";
const TRADE = "ann@hartplastering.example.test";

const replyIcs = buildItipReply({
  uid: UID,
  sequence: 1,
  organizerEmail: REPLY_TO,
  attendee: { name: "Ann Hart", email: TRADE },
  partstat: "ACCEPTED",
  stamp: new Date("2026-12-02T08:05:00Z"),
});

let closers: (() => Promise<void>)[] = [];
afterEach(async () => {
  await Promise.all(closers.map((c) => c()));
  closers = [];
});

async function receiver(onMail: (m: InboundMail) => Promise<void>) {
  const r = await startInboundSmtp({ port: 0, onMail });
  closers.push(() => r.close());
  expect(r.port).toBeGreaterThan(0);
  return r;
}

async function send(port: number, mail: SendMailOptions) {
  const transport = nodemailer.createTransport({
    host: "127.0.0.1",
    port,
    ignoreTLS: true,
  });
  try {
    return await transport.sendMail({
      from: `Ann Hart <${TRADE}>`,
      to: REPLY_TO,
      subject: "Accepted: Template coving",
      text: "Ann Hart has accepted this invitation.",
      ...mail,
    });
  } finally {
    transport.close();
  }
}

describe("startInboundSmtp", () => {
  it("RFC 6047: hands over from/to and ONE calendar part with method REPLY (inline part and .ics are one object)", async () => {
    const got: InboundMail[] = [];
    const r = await receiver(async (m) => {
      got.push(m);
    });
    await send(r.port, {
      envelope: { from: TRADE, to: [REPLY_TO] },
      // as Sitecue's outbound mail does: nodemailer writes a text/calendar; method=REPLY
      // alternative and an invite.ics attachment…
      icalEvent: { method: "REPLY", content: replyIcs },
      // …and a calendar app's own reply.ics attachment on top: three copies of one object
      attachments: [
        {
          filename: "reply.ics",
          content: replyIcs,
          contentType: "text/calendar",
        },
      ],
    });
    expect(got).toHaveLength(1);
    const mail = got[0];
    expect(mail.envelopeFrom).toBe(TRADE);
    expect(mail.from).toBe(TRADE);
    expect(mail.to).toEqual([REPLY_TO]);
    expect(mail.subject).toBe("Accepted: Template coving");
    expect(mail.calendarParts).toHaveLength(1);
    expect(mail.calendarParts[0].method).toBe("REPLY");
    expect(mail.calendarParts[0].content).toBe(replyIcs);
    const parsed = parseItipReply(mail.calendarParts[0].content);
    expect(parsed.ok && parsed.reply).toMatchObject({
      uid: UID,
      sequence: 1,
      partstat: "ACCEPTED",
    });
  });

  it("keeps two different calendar objects apart, and reads METHOD from an .ics with no method parameter", async () => {
    const declined = buildItipReply({
      uid: UID,
      sequence: 1,
      organizerEmail: REPLY_TO,
      attendee: { name: "Ann Hart", email: TRADE },
      partstat: "DECLINED",
      stamp: new Date("2026-12-02T09:00:00Z"),
    });
    const got: InboundMail[] = [];
    const r = await receiver(async (m) => {
      got.push(m);
    });
    await send(r.port, {
      attachments: [
        {
          filename: "a.ics",
          content: replyIcs,
          contentType: "application/ics",
        },
        {
          filename: "b.ics",
          content: declined,
          contentType: "application/ics",
        },
      ],
    });
    expect(got[0].calendarParts.map((p) => p.method)).toEqual([
      "REPLY",
      "REPLY",
    ]);
    expect(got[0].calendarParts.map((p) => p.content)).toEqual([
      replyIcs,
      declined,
    ]);
  });

  it("a message without a calendar gives no calendar parts", async () => {
    const got: InboundMail[] = [];
    const r = await receiver(async (m) => {
      got.push(m);
    });
    await send(r.port, { text: "See you Monday" });
    expect(got[0].calendarParts).toEqual([]);
  });

  it("an onMail that throws makes the send fail with SMTP 550 and the message", async () => {
    const r = await receiver(async () => {
      throw new Error("This address may not answer for booking 3f2b8c1e");
    });
    const err = await send(r.port, {
      icalEvent: { method: "REPLY", content: replyIcs },
    }).then(
      () => null,
      (e: Error & { responseCode?: number; response?: string }) => e,
    );
    expect(err).not.toBeNull();
    expect(err!.responseCode).toBe(550);
    expect(err!.response).toMatch(
      /^550 This address may not answer for booking 3f2b8c1e/,
    );
  });

  it("a refusal message cannot break the SMTP dialogue: CR/LF are flattened", async () => {
    const r = await receiver(async () => {
      throw new Error("line one\r\n250 fake ok");
    });
    const err = await send(r.port, {}).then(
      () => null,
      (e: Error & { responseCode?: number; response?: string }) => e,
    );
    expect(err!.responseCode).toBe(550);
    expect(err!.response).toMatch(/^550 line one 250 fake ok/);
  });

  it("refuses a message over 1 MB with 552, and onMail never sees it", async () => {
    let calls = 0;
    const r = await receiver(async () => {
      calls++;
    });
    const err = await send(r.port, {
      text: "x".repeat(inboundSizeLimit + 1024),
    }).then(
      () => null,
      (e: Error & { responseCode?: number }) => e,
    );
    expect(err).not.toBeNull();
    expect(err!.responseCode).toBe(552);
    expect(calls).toBe(0);
  });

  it("close() stops listening", async () => {
    const r = await startInboundSmtp({ port: 0, onMail: async () => {} });
    await r.close();
    await expect(send(r.port, {})).rejects.toThrow(/ECONNREFUSED|connect/i);
  });
});
