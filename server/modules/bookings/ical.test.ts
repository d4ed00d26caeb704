// Every object is parsed back with ical.js (the reference parser) and checked against the rules
// of RFC 5545 / 5546 / 6047 / 7986 listed in the references (§2); each test names its section.
// Fixtures are written here, not copied from the RFCs (whose examples contain typos).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import ICAL from "ical.js";
import nodemailer from "nodemailer";
import { SMTPServer } from "smtp-server";
import { simpleParser, type Attachment } from "mailparser";
import {
  bookingCalendar,
  invitationMailParts,
  type BookingEventInput,
  type PartStat,
} from "./ical";

type Component = InstanceType<typeof ICAL.Component>;

const UID = "3f2b8c1e-7d4a-4e9b-b2c6-5a1d0e9f8c7b";
const STAMP = new Date("2026-12-01T10:15:30Z");

function booking(over: Partial<BookingEventInput> = {}): BookingEventInput {
  return {
    method: "REQUEST",
    uid: UID,
    sequence: 0,
    stamp: STAMP,
    organizer: {
      name: "Hollin & Vane Joinery",
      email: "booking-3f2b8c1e@reply.hollinvane.example.test",
    },
    attendee: {
      name: "Ann Hart Plastering",
      email: "ann@hartplastering.example.test",
      partstat: "NEEDS-ACTION",
    },
    summary: "Template coving — 12 Rook Lane",
    description: "Template the coving once the side scribes are fixed.",
    location: "Rook Lane, Wrenford",
    timeZone: "Europe/London",
    allDay: false,
    start: "2026-07-01T09:00",
    end: "2026-07-01T12:00",
    alarmEveningBefore: false,
    ...over,
  };
}

function parse(ics: string): Component {
  return new ICAL.Component(ICAL.parse(ics));
}
function vevent(ics: string): Component {
  const events = parse(ics).getAllSubcomponents("vevent");
  expect(events).toHaveLength(1);
  return events[0];
}
/** RFC 5545 §3.1 unfolding: remove every CRLF followed by one space or tab. */
const unfold = (ics: string) => ics.replace(/\r\n[ \t]/g, "");
const contentLines = (ics: string) => unfold(ics).split("\r\n").slice(0, -1);
/** The unfolded lines starting with `name`, outside any VTIMEZONE (whose DTSTARTs are rules). */
const line = (ics: string, name: string) => {
  let inZone = false;
  return contentLines(ics).filter((l) => {
    if (l === "BEGIN:VTIMEZONE") inZone = true;
    if (l === "END:VTIMEZONE") inZone = false;
    return !inZone && l.startsWith(name);
  });
};
const iso = (unixSeconds: number) => new Date(unixSeconds * 1000).toISOString();

describe("RFC 5545 §3.1 content lines", () => {
  // Long enough to fold many times, with 2-byte (£ é) and 4-byte (🪚) characters mixed in so that
  // fold points fall right beside multi-byte characters.
  const summary =
    "Coving £240 · café wall é 🪚 saw-cut ".repeat(6) + "end 🪚🪚🪚🪚🪚🪚🪚🪚";
  const description =
    "Prices: £12.50 per length; prime é 🪚 then ".repeat(8) + "🪚é£".repeat(20);
  const ics = bookingCalendar(booking({ summary, description }));

  it("§3.1: every line ends with CRLF, the last one too, and no bare CR or LF", () => {
    expect(ics.endsWith("END:VCALENDAR\r\n")).toBe(true);
    const withoutCrlf = ics.replace(/\r\n/g, "");
    expect(withoutCrlf).not.toMatch(/[\r\n]/);
  });

  it("§3.1: no line is longer than 75 octets", () => {
    const lines = ics.split("\r\n");
    const longest = Math.max(...lines.map((l) => Buffer.byteLength(l, "utf8")));
    expect(longest).toBeLessThanOrEqual(75);
    // the fixture really is long: its SUMMARY alone is several lines' worth
    expect(Buffer.byteLength(summary, "utf8")).toBeGreaterThan(3 * 75);
  });

  it("§3.1: long lines are folded with CRLF + exactly one space", () => {
    const physical = ics.split("\r\n");
    const continuations = physical.filter((l) => /^[ \t]/.test(l));
    expect(continuations.length).toBeGreaterThan(6);
    // folded with a space (not a tab), which unfolding removes
    for (const l of continuations) expect(l[0]).toBe(" ");
    // one space only is removed when unfolding: the lines still start with a property name
    for (const l of contentLines(ics)) expect(l).toMatch(/^[A-Z-]+[;:]/);
  });

  it("§3.1: a fold never splits a UTF-8 character (each physical line is valid UTF-8 alone)", () => {
    const bytes = Buffer.from(ics, "utf8");
    const decoder = new TextDecoder("utf-8", { fatal: true });
    let start = 0;
    let foldsBesideMultibyte = 0;
    for (let i = 0; i < bytes.length - 1; i++) {
      if (bytes[i] === 0x0d && bytes[i + 1] === 0x0a) {
        // throws on a line that starts or ends inside a multi-byte sequence
        decoder.decode(bytes.subarray(start, i));
        if (
          bytes[i + 2] === 0x20 &&
          (bytes[i - 1] >= 0x80 || bytes[i + 3] >= 0x80)
        )
          foldsBesideMultibyte++;
        start = i + 2;
      }
    }
    // the check is only meaningful if some folds land next to a multi-byte character
    expect(foldsBesideMultibyte).toBeGreaterThan(0);
    // and no lone surrogate (a split emoji) slipped into the JavaScript string
    expect(ics).not.toMatch(/[\ud800-\udbff](?![\udc00-\udfff])/);
    expect(ics).not.toMatch(/(?<![\ud800-\udbff])[\udc00-\udfff]/);
  });

  it("§3.1: the unfolded SUMMARY and DESCRIPTION round-trip exactly through ical.js", () => {
    const ev = vevent(ics);
    expect(ev.getFirstPropertyValue("summary")).toBe(summary);
    expect(ev.getFirstPropertyValue("description")).toBe(description);
  });
});

describe("RFC 5545 §3.3.11 TEXT escaping", () => {
  const summary = "Back\\slash, comma; semicolon\nnew line: colon";
  const ics = bookingCalendar(
    booking({ summary, location: "Flat 2; 3, Rook Lane" }),
  );

  it("§3.3.11: backslash, comma, semicolon and newline are escaped as \\\\ \\, \\; \\n", () => {
    expect(line(ics, "SUMMARY:")).toEqual([
      "SUMMARY:Back\\\\slash\\, comma\\; semicolon\\nnew line: colon",
    ]);
    expect(line(ics, "LOCATION:")).toEqual([
      "LOCATION:Flat 2\\; 3\\, Rook Lane",
    ]);
  });

  it("§3.3.11: a colon is never escaped", () => {
    expect(unfold(ics)).not.toContain("\\:");
  });

  it("§3.3.11: ical.js reads the original text back", () => {
    const ev = vevent(ics);
    expect(ev.getFirstPropertyValue("summary")).toBe(summary);
    expect(ev.getFirstPropertyValue("location")).toBe("Flat 2; 3, Rook Lane");
  });
});

describe("RFC 5545 §3.2 parameter values", () => {
  it('§3.2: a CN holding "," ":" or ";" is quoted: CN="Vane, Hollin"', () => {
    const ics = bookingCalendar(
      booking({
        organizer: { name: "Vane, Hollin", email: "b-1@reply.example.test" },
        attendee: {
          name: "Hart: Plaster; Coving",
          email: "ann@hart.example.test",
          partstat: "NEEDS-ACTION",
        },
      }),
    );
    expect(line(ics, "ORGANIZER")).toEqual([
      'ORGANIZER;CN="Vane, Hollin":mailto:b-1@reply.example.test',
    ]);
    expect(line(ics, "ATTENDEE")[0]).toContain(';CN="Hart: Plaster; Coving"');
    const ev = vevent(ics);
    expect(ev.getFirstProperty("organizer")!.getParameter("cn")).toBe(
      "Vane, Hollin",
    );
    expect(ev.getFirstProperty("attendee")!.getParameter("cn")).toBe(
      "Hart: Plaster; Coving",
    );
    expect(ev.getFirstPropertyValue("attendee")).toBe(
      "MAILTO:ann@hart.example.test",
    );
  });

  it("§3.2 with RFC 6868: a double quote in a name survives (as ^') instead of breaking the line", () => {
    const ics = bookingCalendar(
      booking({
        attendee: {
          name: 'Ann "Trowel" Hart',
          email: "ann@hart.example.test",
          partstat: "NEEDS-ACTION",
        },
      }),
    );
    expect(line(ics, "ATTENDEE")[0]).toContain(`CN="Ann ^'Trowel^' Hart"`);
    const att = vevent(ics).getFirstProperty("attendee")!;
    expect(att.getParameter("cn")).toBe('Ann "Trowel" Hart');
    expect(att.getFirstValue()).toBe("MAILTO:ann@hart.example.test");
  });
});

describe("RFC 5545 §3.6.1 / §3.8.2.2 all-day bookings", () => {
  const ics = bookingCalendar(
    booking({ allDay: true, start: "2026-12-14", end: "2026-12-16" }),
  );

  it("Mon 14 – Wed 16 Dec 2026 ⇒ DTSTART;VALUE=DATE:20261214 and exclusive DTEND;VALUE=DATE:20261217", () => {
    expect(line(ics, "DTSTART")).toEqual(["DTSTART;VALUE=DATE:20261214"]);
    expect(line(ics, "DTEND")).toEqual(["DTEND;VALUE=DATE:20261217"]);
    const ev = new ICAL.Event(vevent(ics));
    expect(ev.startDate.isDate).toBe(true);
    expect(ev.endDate.isDate).toBe(true);
    expect(ev.startDate.toString()).toBe("2026-12-14");
    expect(ev.endDate.toString()).toBe("2026-12-17");
    expect(ev.duration.toSeconds()).toBe(3 * 86400);
  });

  it("§3.2.19: an all-day booking uses no TZID, so it needs no VTIMEZONE", () => {
    expect(unfold(ics)).not.toContain("TZID");
    expect(parse(ics).getAllSubcomponents("vtimezone")).toHaveLength(0);
  });

  it("a single day: DTEND is the next day", () => {
    const one = bookingCalendar(
      booking({ allDay: true, start: "2026-12-31", end: "2026-12-31" }),
    );
    expect(line(one, "DTEND")).toEqual(["DTEND;VALUE=DATE:20270101"]);
  });

  it("refuses a last day before the first", () => {
    expect(() =>
      bookingCalendar(
        booking({ allDay: true, start: "2026-12-14", end: "2026-12-13" }),
      ),
    ).toThrow(/before start/);
  });
});

describe("RFC 5545 §3.2.19 / §3.6.5 time zones", () => {
  const ics = bookingCalendar(booking());

  it("§3.2.19: every TZID used has a VTIMEZONE with that TZID", () => {
    const used = new Set(
      [...unfold(ics).matchAll(/;TZID=([^;:]+)[;:]/g)].map((m) => m[1]),
    );
    expect([...used]).toEqual(["Europe/London"]);
    const defined = parse(ics)
      .getAllSubcomponents("vtimezone")
      .map((z) => z.getFirstPropertyValue("tzid"));
    for (const tz of used) expect(defined).toContain(tz);
    expect(line(ics, "DTSTART")).toEqual([
      "DTSTART;TZID=Europe/London:20260701T090000",
    ]);
    expect(line(ics, "DTEND")).toEqual([
      "DTEND;TZID=Europe/London:20260701T120000",
    ]);
  });

  it("§3.6.5: Europe/London's rules — daylight from the last Sunday of March 01:00 GMT, standard from the last Sunday of October 02:00 BST", () => {
    const vtz = parse(ics).getFirstSubcomponent("vtimezone")!;
    const daylight = vtz.getFirstSubcomponent("daylight")!;
    const standard = vtz.getFirstSubcomponent("standard")!;
    const rule = (c: Component) =>
      String(c.getFirstProperty("rrule")!.getFirstValue());
    const offset = (c: Component, p: string) =>
      String(c.getFirstPropertyValue(p));
    // DTSTART of an onset is the local time before the change (RFC 5545 §3.6.5).
    expect(String(daylight.getFirstPropertyValue("dtstart"))).toMatch(
      /-03-\d\dT01:00:00$/,
    );
    expect(rule(daylight)).toMatch(/FREQ=YEARLY/);
    expect(rule(daylight)).toMatch(/BYMONTH=3/);
    expect(rule(daylight)).toMatch(/BYDAY=-1SU/);
    expect(offset(daylight, "tzoffsetfrom")).toBe("+00:00");
    expect(offset(daylight, "tzoffsetto")).toBe("+01:00");
    expect(String(standard.getFirstPropertyValue("dtstart"))).toMatch(
      /-10-\d\dT02:00:00$/,
    );
    expect(rule(standard)).toMatch(/BYMONTH=10/);
    expect(rule(standard)).toMatch(/BYDAY=-1SU/);
    expect(offset(standard, "tzoffsetfrom")).toBe("+01:00");
    expect(offset(standard, "tzoffsetto")).toBe("+00:00");
  });

  it("§3.6.5 via ical.js: 2026-07-01 09:00 London is 08:00Z, 2026-12-01 09:00 is 09:00Z", () => {
    const summer = new ICAL.Event(vevent(ics));
    // ical.js has no zone database of its own: the conversion uses the file's VTIMEZONE
    expect(ICAL.TimezoneService.has("Europe/London")).toBe(false);
    expect(summer.startDate.zone?.tzid).toBe("Europe/London");
    expect(iso(summer.startDate.toUnixTime())).toBe("2026-07-01T08:00:00.000Z");
    const winter = new ICAL.Event(
      vevent(
        bookingCalendar(
          booking({ start: "2026-12-01T09:00", end: "2026-12-01T10:00" }),
        ),
      ),
    );
    expect(iso(winter.startDate.toUnixTime())).toBe("2026-12-01T09:00:00.000Z");
  });

  it("§3.6.5 via ical.js: the changes fall on 29 Mar and 25 Oct 2026 at 01:00 UTC (references §4)", () => {
    const at = (start: string, end: string) =>
      iso(
        new ICAL.Event(
          vevent(bookingCalendar(booking({ start, end }))),
        ).startDate.toUnixTime(),
      );
    expect(at("2026-03-29T00:30", "2026-03-29T00:45")).toBe(
      "2026-03-29T00:30:00.000Z",
    );
    expect(at("2026-03-29T02:30", "2026-03-29T03:00")).toBe(
      "2026-03-29T01:30:00.000Z",
    );
    expect(at("2026-10-25T00:30", "2026-10-25T00:45")).toBe(
      "2026-10-24T23:30:00.000Z",
    );
    expect(at("2026-10-25T02:30", "2026-10-25T03:00")).toBe(
      "2026-10-25T02:30:00.000Z",
    );
  });

  it("refuses a local time that the spring change skips, and an unknown zone", () => {
    expect(() =>
      bookingCalendar(
        booking({ start: "2026-03-29T01:30", end: "2026-03-29T03:00" }),
      ),
    ).toThrow(/does not exist/);
    expect(() =>
      bookingCalendar(booking({ timeZone: "Europe/Nowhere" })),
    ).toThrow(/time zone/i);
  });

  it("§3.2.19: a zone link (GB) is written by its canonical TZID, the one its VTIMEZONE defines", () => {
    const gb = bookingCalendar(booking({ timeZone: "GB" }));
    expect(line(gb, "DTSTART")).toEqual([
      "DTSTART;TZID=Europe/London:20260701T090000",
    ]);
    expect(
      parse(gb)
        .getFirstSubcomponent("vtimezone")!
        .getFirstPropertyValue("tzid"),
    ).toBe("Europe/London");
    expect(unfold(gb)).not.toContain("TZID=GB");
  });

  it("UTC is written as UTC times, with no TZID (RFC 5545 §3.3.5 form 2)", () => {
    const utc = bookingCalendar(booking({ timeZone: "UTC" }));
    expect(line(utc, "DTSTART")).toEqual(["DTSTART:20260701T090000Z"]);
    expect(unfold(utc)).not.toContain("TZID");
  });
});

describe("RFC 5545 §3.8.7.2 DTSTAMP and RFC 7986 §5.3 UID", () => {
  const ics = bookingCalendar(booking());

  it("§3.8.7.2: DTSTAMP is in UTC even though the event has a TZID", () => {
    expect(line(ics, "DTSTAMP")).toEqual(["DTSTAMP:20261201T101530Z"]);
    const stamp = vevent(ics).getFirstPropertyValue("dtstamp") as InstanceType<
      typeof ICAL.Time
    >;
    expect(stamp.zone).toBe(ICAL.Timezone.utcTimezone);
    expect(iso(stamp.toUnixTime())).toBe(STAMP.toISOString());
  });

  it("RFC 7986 §5.3: UID is the given UUID and reveals no e-mail address or host", () => {
    const uid = String(vevent(ics).getFirstPropertyValue("uid"));
    expect(uid).toBe(UID);
    expect(uid).not.toContain("@");
    expect(uid).not.toMatch(/example|hollin|hart|sitecue/i);
  });

  it("RFC 7986 §5.3: a UID that is not a UUID is refused", () => {
    expect(() =>
      bookingCalendar(booking({ uid: "booking-42@sitecue.example.test" })),
    ).toThrow(/UUID/);
  });
});

describe("RFC 5546 methods, SEQUENCE and attendees", () => {
  it("§2.1.4: SEQUENCE is written as given", () => {
    expect(
      vevent(bookingCalendar(booking({ sequence: 0 }))).getFirstPropertyValue(
        "sequence",
      ),
    ).toBe(0);
    expect(
      vevent(bookingCalendar(booking({ sequence: 3 }))).getFirstPropertyValue(
        "sequence",
      ),
    ).toBe(3);
    expect(() => bookingCalendar(booking({ sequence: -1 }))).toThrow(
      /sequence/,
    );
  });

  it("§3.2.2: a REQUEST has METHOD:REQUEST, STATUS:CONFIRMED, ORGANIZER and the ATTENDEE", () => {
    const ics = bookingCalendar(booking());
    const root = parse(ics);
    expect(root.getFirstPropertyValue("method")).toBe("REQUEST");
    const ev = vevent(ics);
    expect(ev.getFirstPropertyValue("status")).toBe("CONFIRMED");
    expect(ev.getFirstPropertyValue("organizer")).toBe(
      "mailto:booking-3f2b8c1e@reply.hollinvane.example.test",
    );
    expect(ev.getAllProperties("attendee")).toHaveLength(1);
  });

  it.each<PartStat>(["NEEDS-ACTION", "ACCEPTED", "DECLINED", "TENTATIVE"])(
    "RFC 5545 §3.2.12/§3.2.16/§3.2.17: the attendee has RSVP=TRUE, ROLE=REQ-PARTICIPANT and PARTSTAT=%s as given",
    (partstat) => {
      const ics = bookingCalendar(
        booking({
          attendee: {
            name: "Ann Hart",
            email: "ann@hart.example.test",
            partstat,
          },
        }),
      );
      const att = vevent(ics).getFirstProperty("attendee")!;
      expect(att.getParameter("partstat")).toBe(partstat);
      expect(att.getParameter("rsvp")).toBe("TRUE");
      expect(att.getParameter("role")).toBe("REQ-PARTICIPANT");
    },
  );

  it("§3.2.5: a CANCEL has METHOD:CANCEL, STATUS:CANCELLED, the attendee, and the SEQUENCE given", () => {
    const ics = bookingCalendar(
      booking({ method: "CANCEL", sequence: 2, alarmEveningBefore: true }),
    );
    expect(parse(ics).getFirstPropertyValue("method")).toBe("CANCEL");
    const ev = vevent(ics);
    expect(ev.getFirstPropertyValue("status")).toBe("CANCELLED");
    expect(ev.getFirstPropertyValue("sequence")).toBe(2);
    expect(ev.getFirstPropertyValue("uid")).toBe(UID);
    expect(ev.getAllProperties("attendee")).toHaveLength(1);
    // a cancelled visit reminds nobody, and asks for no answer
    expect(ev.getAllSubcomponents("valarm")).toHaveLength(0);
    expect(
      ev.getFirstProperty("attendee")!.getParameter("rsvp"),
    ).toBeUndefined();
  });

  it("§3.2.1: a PUBLISH has an ORGANIZER and no ATTENDEE", () => {
    const { attendee: _none, ...noAttendee } = booking({ method: "PUBLISH" });
    const ics = bookingCalendar(noAttendee);
    expect(parse(ics).getFirstPropertyValue("method")).toBe("PUBLISH");
    const ev = vevent(ics);
    expect(ev.getAllProperties("organizer")).toHaveLength(1);
    expect(ev.getAllProperties("attendee")).toHaveLength(0);
    expect(ev.getFirstPropertyValue("status")).toBe("CONFIRMED");
  });

  it("§3.2.1/§3.2.2: refuses a PUBLISH with an attendee and a REQUEST without one", () => {
    expect(() => bookingCalendar(booking({ method: "PUBLISH" }))).toThrow(
      /PUBLISH/,
    );
    expect(() => bookingCalendar(booking({ attendee: undefined }))).toThrow(
      /attendee/,
    );
  });

  it("one METHOD per object: mixed methods, or a REQUEST with two bookings, are refused", () => {
    const { attendee: _a, ...feedItem } = booking({ method: "PUBLISH" });
    expect(() => bookingCalendar([booking(), { ...feedItem }])).toThrow(
      /same method/,
    );
    expect(() =>
      bookingCalendar([
        booking(),
        booking({ uid: "9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d" }),
      ]),
    ).toThrow(/one booking/);
  });

  it("a feed: several PUBLISH events, RFC 7986 §5.7 REFRESH-INTERVAL and §5.1 NAME", () => {
    const { attendee: _a, ...item } = booking({ method: "PUBLISH" });
    const ics = bookingCalendar(
      [
        item,
        {
          ...item,
          uid: "9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d",
          allDay: true,
          start: "2026-12-14",
          end: "2026-12-16",
        },
      ],
      { name: "Visits; Rook Lane, Wrenford", refreshIntervalHours: 6 },
    );
    const root = parse(ics);
    expect(root.getAllSubcomponents("vevent")).toHaveLength(2);
    expect(line(ics, "REFRESH-INTERVAL")).toEqual([
      "REFRESH-INTERVAL;VALUE=DURATION:PT6H",
    ]);
    expect(String(root.getFirstPropertyValue("refresh-interval"))).toBe("PT6H");
    expect(line(ics, "NAME:")).toEqual([
      "NAME:Visits\\; Rook Lane\\, Wrenford",
    ]);
    // ical.js 2.2 does not know RFC 7986's NAME: tell it the value type §5.1 gives it (TEXT)
    // to check the escaped text reads back as written.
    const props = (
      ICAL.design as unknown as {
        icalendar: { property: Record<string, unknown> };
      }
    ).icalendar.property;
    props.name = { defaultType: "text" };
    try {
      expect(parse(ics).getFirstPropertyValue("name")).toBe(
        "Visits; Rook Lane, Wrenford",
      );
    } finally {
      delete props.name;
    }
    // no REFRESH-INTERVAL unless asked
    expect(unfold(bookingCalendar(booking()))).not.toContain(
      "REFRESH-INTERVAL",
    );
  });

  it("URL is written when given (RFC 5545 §3.8.4.6)", () => {
    const url = "https://sitecue.example.test/b/Xy7?z=1";
    expect(
      vevent(bookingCalendar(booking({ url }))).getFirstPropertyValue("url"),
    ).toBe(url);
  });
});

describe("RFC 5545 §3.6.6 VALARM the evening before", () => {
  type Duration = InstanceType<typeof ICAL.Duration>;
  function alarmOf(ics: string) {
    const ev = vevent(ics);
    const alarms = ev.getAllSubcomponents("valarm");
    expect(alarms).toHaveLength(1);
    const alarm = alarms[0];
    expect(alarm.getFirstPropertyValue("action")).toBe("DISPLAY");
    // §3.6.6: a DISPLAY alarm must have a DESCRIPTION
    expect(String(alarm.getFirstPropertyValue("description"))).toMatch(
      /^Tomorrow: /,
    );
    const trigger = alarm.getFirstPropertyValue("trigger") as Duration;
    // §3.8.6.3: relative to the start (no RELATED=END)
    expect(
      alarm.getFirstProperty("trigger")!.getParameter("related"),
    ).toBeUndefined();
    return { event: new ICAL.Event(ev), trigger };
  }

  it("a timed visit Wed 1 Jul 2026 09:00 London alarms at 18:00 BST on Tue 30 Jun (17:00Z)", () => {
    const { event, trigger } = alarmOf(
      bookingCalendar(booking({ alarmEveningBefore: true })),
    );
    // §3.3.6: hours in a duration are exact, so the instant is the start's instant + the duration
    const fires = event.startDate.toUnixTime() + trigger.toSeconds();
    expect(iso(fires)).toBe("2026-06-30T17:00:00.000Z");
    // and ical.js's own wall-clock arithmetic agrees on a day without a clock change
    const t = event.startDate.clone();
    t.addDuration(trigger);
    expect(t.toString()).toBe("2026-06-30T18:00:00");
  });

  it("§3.3.6 across a clock change: a visit Sun 29 Mar 2026 09:00 BST alarms at 18:00 GMT on Sat 28 Mar", () => {
    const { event, trigger } = alarmOf(
      bookingCalendar(
        booking({
          start: "2026-03-29T09:00",
          end: "2026-03-29T12:00",
          alarmEveningBefore: true,
        }),
      ),
    );
    expect(trigger.toString()).toBe("-PT14H");
    expect(iso(event.startDate.toUnixTime() + trigger.toSeconds())).toBe(
      "2026-03-28T18:00:00.000Z",
    );
  });

  it("§3.3.6 across the autumn change: Sun 25 Oct 2026 09:00 GMT alarms at 18:00 BST on Sat 24 Oct", () => {
    const { event, trigger } = alarmOf(
      bookingCalendar(
        booking({
          start: "2026-10-25T09:00",
          end: "2026-10-25T12:00",
          alarmEveningBefore: true,
        }),
      ),
    );
    expect(iso(event.startDate.toUnixTime() + trigger.toSeconds())).toBe(
      "2026-10-24T17:00:00.000Z",
    );
  });

  it("an all-day booking from Mon 14 Dec 2026 alarms at 18:00 local on Sun 13 Dec", () => {
    const { event, trigger } = alarmOf(
      bookingCalendar(
        booking({
          allDay: true,
          start: "2026-12-14",
          end: "2026-12-16",
          alarmEveningBefore: true,
        }),
      ),
    );
    const t = event.startDate.clone();
    t.isDate = false; // a DATE start is local midnight (floating)
    t.addDuration(trigger);
    expect(t.toString()).toBe("2026-12-13T18:00:00");
  });

  it("no VALARM unless asked", () => {
    expect(
      vevent(bookingCalendar(booking())).getAllSubcomponents("valarm"),
    ).toHaveLength(0);
  });
});

describe("RFC 6047 §2.4 invitation e-mail through nodemailer", () => {
  let server: SMTPServer;
  let port = 0;
  const received: string[] = [];

  beforeAll(async () => {
    server = new SMTPServer({
      authOptional: true,
      disabledCommands: ["STARTTLS"],
      logger: false,
      onData(stream, _s, cb) {
        const chunks: Buffer[] = [];
        stream.on("data", (c: Buffer) => chunks.push(c));
        stream.on("end", () => {
          received.push(Buffer.concat(chunks).toString("utf8"));
          cb();
        });
      },
    });
    await new Promise<void>((r) => server.listen(0, "127.0.0.1", () => r()));
    const a = server.server.address();
    port = typeof a === "object" && a ? a.port : 0;
  });
  afterAll(() => new Promise<void>((r) => server.close(() => r())));

  async function send(ics: string, method: "REQUEST" | "CANCEL") {
    const transport = nodemailer.createTransport({
      host: "127.0.0.1",
      port,
      ignoreTLS: true,
    });
    try {
      await transport.sendMail({
        from: "Hollin & Vane Joinery <booking-3f2b8c1e@reply.hollinvane.example.test>",
        to: "ann@hartplastering.example.test",
        subject: "Template coving — Wed 1 Jul",
        text: "Please confirm: Wed 1 Jul, 09:00–12:00.",
        html: "<p>Please confirm: Wed 1 Jul, 09:00–12:00.</p>",
        ...invitationMailParts(ics, method),
      });
    } finally {
      transport.close();
    }
    return received[received.length - 1];
  }

  const ctype = (att: Attachment) =>
    att.headers.get("content-type") as {
      value: string;
      params: Record<string, string>;
    };

  it("§2.4: Content-Type text/calendar; method=REQUEST; charset=UTF-8, beside text and HTML, plus invite.ics", async () => {
    const ics = bookingCalendar(booking());
    const raw = await send(ics, "REQUEST");
    const parsed = await simpleParser(raw);
    // the human-readable parts
    expect(parsed.text?.trim()).toBe("Please confirm: Wed 1 Jul, 09:00–12:00.");
    expect(parsed.html).toContain("<p>Please confirm");
    const cals = parsed.attachments.filter(
      (a) => a.contentType === "text/calendar",
    );
    expect(cals).toHaveLength(1);
    const ct = ctype(cals[0]);
    expect(ct.value.toLowerCase()).toBe("text/calendar");
    expect(ct.params.method.toUpperCase()).toBe("REQUEST");
    expect(ct.params.charset.toUpperCase()).toBe("UTF-8");
    // §2.4: the method parameter equals the object's METHOD, and the object is intact
    const content = cals[0].content.toString("utf8");
    expect(content).toBe(ics);
    expect(parse(content).getFirstPropertyValue("method")).toBe(
      ct.params.method.toUpperCase(),
    );
    // the text/calendar part sits in the multipart/alternative with the text body
    const alt =
      /Content-Type: multipart\/alternative;\s*boundary="?([^"\r\n]+)"?/i.exec(
        raw,
      );
    expect(alt).not.toBeNull();
    const sections = raw.split(`--${alt![1]}`);
    expect(
      sections.some((s) => /^\r\nContent-Type: text\/plain/i.test(s)),
    ).toBe(true);
    expect(
      sections.some((s) =>
        /^\r\nContent-Type: text\/calendar; charset=utf-8; method=REQUEST/i.test(
          s,
        ),
      ),
    ).toBe(true);
    // and the same object as an .ics attachment
    const files = parsed.attachments.filter((a) => a.filename === "invite.ics");
    expect(files).toHaveLength(1);
    expect(files[0].contentDisposition).toBe("attachment");
    expect(files[0].content.toString("utf8")).toBe(ics);
  });

  it("§2.4: a cancellation goes out as method=CANCEL", async () => {
    const ics = bookingCalendar(booking({ method: "CANCEL", sequence: 1 }));
    const parsed = await simpleParser(await send(ics, "CANCEL"));
    const cal = parsed.attachments.find(
      (a) => a.contentType === "text/calendar",
    )!;
    expect(ctype(cal).params.method).toBe("CANCEL");
    expect(
      vevent(cal.content.toString("utf8")).getFirstPropertyValue("status"),
    ).toBe("CANCELLED");
  });

  it("§2.4: invitationMailParts refuses a method that differs from the object's METHOD", () => {
    expect(() =>
      invitationMailParts(bookingCalendar(booking()), "CANCEL"),
    ).toThrow(/METHOD:REQUEST/);
  });
});
