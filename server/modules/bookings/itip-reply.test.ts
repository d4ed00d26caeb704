// iTIP REPLY (RFC 5546 §3.2.3): built with ical.js the way a calendar app does, read back by
// parseItipReply; and the replies it must refuse, each with a plain-English reason.
import { describe, expect, it } from "vitest";
import ICAL from "ical.js";
import { buildItipReply, parseItipReply } from "./itip-reply";
import { bookingCalendar } from "./ical";

const UID = "3f2b8c1e-7d4a-4e9b-b2c6-5a1d0e9f8c7b";
const ORGANIZER = "booking-3f2b8c1e@reply.hollinvane.example.test";
const STAMP = new Date("2026-12-02T08:05:00Z");

function reply(over: Partial<Parameters<typeof buildItipReply>[0]> = {}) {
  return buildItipReply({
    uid: UID,
    sequence: 2,
    organizerEmail: ORGANIZER,
    attendee: { name: "Hart, Ann", email: "Ann@HartPlastering.example.test" },
    partstat: "ACCEPTED",
    stamp: STAMP,
    ...over,
  });
}
const unfold = (ics: string) => ics.replace(/\r\n[ \t]/g, "");

function problemOf(ics: string): string {
  const r = parseItipReply(ics);
  if (r.ok)
    throw new Error(`expected a refusal, got ${JSON.stringify(r.reply)}`);
  return r.problem;
}

describe("buildItipReply (RFC 5546 §3.2.3, as a calendar app writes it)", () => {
  const ics = reply({ comment: "Can do mornings only" });
  const root = new ICAL.Component(ICAL.parse(ics));
  const ev = root.getFirstSubcomponent("vevent")!;

  it("§3.2.3: METHOD:REPLY, one VEVENT, one ATTENDEE with the PARTSTAT, the request's UID and SEQUENCE", () => {
    expect(root.getFirstPropertyValue("method")).toBe("REPLY");
    expect(root.getAllSubcomponents("vevent")).toHaveLength(1);
    expect(ev.getAllProperties("attendee")).toHaveLength(1);
    expect(ev.getFirstProperty("attendee")!.getParameter("partstat")).toBe(
      "ACCEPTED",
    );
    expect(ev.getFirstPropertyValue("uid")).toBe(UID);
    expect(ev.getFirstPropertyValue("sequence")).toBe(2);
    expect(ev.getFirstPropertyValue("organizer")).toBe(`mailto:${ORGANIZER}`);
  });

  it("RFC 5545 §3.8.7.2: DTSTAMP in UTC", () => {
    expect(unfold(ics)).toContain("\r\nDTSTAMP:20261202T080500Z\r\n");
  });

  it("RFC 5545 §3.2: a CN with a comma is quoted", () => {
    expect(unfold(ics)).toContain('CN="Hart, Ann"');
  });

  it("RFC 5545 §3.1: CRLF line ends and lines of at most 75 octets", () => {
    expect(ics.endsWith("END:VCALENDAR\r\n")).toBe(true);
    expect(ics.replace(/\r\n/g, "")).not.toMatch(/[\r\n]/);
    for (const l of ics.split("\r\n"))
      expect(Buffer.byteLength(l)).toBeLessThanOrEqual(75);
  });
});

describe("parseItipReply", () => {
  it.each(["ACCEPTED", "DECLINED", "TENTATIVE"] as const)(
    "RFC 5546 §3.2.3: reads a %s reply built by ical.js",
    (partstat) => {
      const r = parseItipReply(reply({ partstat }));
      expect(r).toEqual({
        ok: true,
        reply: {
          method: "REPLY",
          uid: UID,
          sequence: 2,
          attendeeEmail: "ann@hartplastering.example.test",
          partstat,
          proposedStart: null,
          comment: null,
        },
      });
    },
  );

  it('RFC 5546 §3.2.7: reads a COUNTER ("Propose new time") with its proposed first day', () => {
    const r = parseItipReply(
      reply({ partstat: "TENTATIVE", counterStart: "2026-12-14" }),
    );
    expect(r.ok && r.reply).toMatchObject({
      method: "COUNTER",
      uid: UID,
      sequence: 2,
      proposedStart: "2026-12-14",
    });
  });

  it("RFC 5545 §3.8.1.4: keeps the COMMENT the trade typed, unescaped", () => {
    const r = parseItipReply(
      reply({
        partstat: "DECLINED",
        comment: "Away that week; try 21st, please",
      }),
    );
    expect(r.ok && r.reply.comment).toBe("Away that week; try 21st, please");
  });

  it("RFC 5546 §3.2.3: SEQUENCE may be left out when it is 0", () => {
    const ics = reply({ sequence: 0 }).replace(/\r\nSEQUENCE:0\r\n/, "\r\n");
    expect(ics).not.toContain("SEQUENCE");
    const r = parseItipReply(ics);
    expect(r.ok && r.reply.sequence).toBe(0);
  });

  it("reads a reply whose METHOD and PARTSTAT are in lower case (RFC 5545 §2.1: case-insensitive)", () => {
    const ics = reply()
      .replace("METHOD:REPLY", "METHOD:reply")
      .replace("PARTSTAT=ACCEPTED", "PARTSTAT=accepted");
    const r = parseItipReply(ics);
    expect(r.ok && r.reply.partstat).toBe("ACCEPTED");
  });

  it("RFC 5546 §3.2.3: refuses an object that is not METHOD:REPLY (here Sitecue's own REQUEST)", () => {
    const request = bookingCalendar({
      method: "REQUEST",
      uid: UID,
      sequence: 2,
      stamp: STAMP,
      organizer: { name: "Hollin & Vane", email: ORGANIZER },
      attendee: {
        name: "Ann Hart",
        email: "ann@hartplastering.example.test",
        partstat: "ACCEPTED",
      },
      summary: "Template coving",
      description: "",
      location: "",
      timeZone: "Europe/London",
      allDay: true,
      start: "2026-12-14",
      end: "2026-12-14",
      alarmEveningBefore: false,
    });
    expect(problemOf(request)).toBe(
      "This is a REQUEST message, not a reply to an invitation (METHOD:REPLY).",
    );
    expect(problemOf(reply().replace("METHOD:REPLY\r\n", ""))).toMatch(
      /has no METHOD/,
    );
  });

  it("RFC 5546 §3.2.3: refuses a reply with two ATTENDEEs", () => {
    const two = reply().replace(
      /(\r\nATTENDEE[^]*?\r\n)(?! )/,
      "$1ATTENDEE;PARTSTAT=ACCEPTED:mailto:someone@else.example.test\r\n",
    );
    expect(unfold(two).match(/\r\nATTENDEE/g)).toHaveLength(2);
    expect(problemOf(two)).toBe(
      "A reply must name exactly one attendee, the one answering; this one names 2.",
    );
  });

  it("RFC 5546 §3.2.3: refuses a reply with no ATTENDEE", () => {
    const none = unfold(reply()).replace(/\r\nATTENDEE[^\r]*/, "");
    expect(problemOf(none)).toMatch(/names no attendee/);
  });

  it("RFC 5546 §3.2.3: refuses a PARTSTAT other than ACCEPTED, DECLINED or TENTATIVE", () => {
    const delegated = reply().replace(
      "PARTSTAT=ACCEPTED",
      "PARTSTAT=DELEGATED",
    );
    expect(problemOf(delegated)).toBe(
      'The answer "DELEGATED" is not one Sitecue understands (accepted, declined or tentative).',
    );
    const needs = reply().replace("PARTSTAT=ACCEPTED", "PARTSTAT=NEEDS-ACTION");
    expect(problemOf(needs)).toMatch(
      /"NEEDS-ACTION" is not one Sitecue understands/,
    );
    const missing = unfold(reply()).replace(";PARTSTAT=ACCEPTED", "");
    expect(problemOf(missing)).toBe(
      "The reply gives no answer (PARTSTAT) for the attendee.",
    );
  });

  it("RFC 5546 §3.2.3: refuses a reply without a UID", () => {
    const ics = reply().replace(`\r\nUID:${UID}\r\n`, "\r\n");
    expect(ics).not.toContain("UID:");
    expect(problemOf(ics)).toBe(
      "The reply has no UID, so it cannot be matched to a booking.",
    );
  });

  it("RFC 5546 §3.2.3: refuses two VEVENTs, or none", () => {
    const ev = /BEGIN:VEVENT[^]*END:VEVENT\r\n/.exec(reply())![0];
    const twice = reply().replace(ev, ev + ev);
    expect(problemOf(twice)).toBe(
      "A reply must hold exactly one event (VEVENT); this one holds 2.",
    );
    expect(problemOf(reply().replace(ev, ""))).toMatch(/holds 0/);
  });

  it("refuses an attendee without a mailto: address, and text that is not iCalendar", () => {
    const noMail = unfold(reply()).replace(
      "mailto:Ann@HartPlastering.example.test",
      "urn:uuid:1b2c3d4e-1111-4222-8333-944455556666",
    );
    expect(problemOf(noMail)).toBe(
      "The attendee in the reply has no usable mailto: address.",
    );
    expect(problemOf("Thanks, see you Monday!")).toMatch(/could not be read/);
    expect(
      problemOf("BEGIN:VCARD\r\nVERSION:4.0\r\nFN:Ann\r\nEND:VCARD\r\n"),
    ).toMatch(/not an iCalendar object/);
  });
});
