// iTIP REPLY (RFC 5546 §3.2.3): what a trade's calendar app sends when they tap Accept, Decline
// or Maybe on an invitation. Parsed with ical.js, the reference parser. Checking who may answer
// (RFC 6047 §2.2.1: the sender must be the invited attendee; UID and SEQUENCE must match the
// booking) is the bookings service's job: this module only reads the object faithfully.
import ICAL from "ical.js";

/** What a usable REPLY or COUNTER says: which booking (UID, SEQUENCE), who answers, and the answer. */
export interface ParsedReply {
  /** REPLY answers (RFC 5546 §3.2.3); COUNTER proposes another time (§3.2.7, "Propose new time"). */
  method: "REPLY" | "COUNTER";
  uid: string;
  sequence: number;
  /** The ATTENDEE's mailto: address, lower-cased for comparison. */
  attendeeEmail: string;
  /** A REPLY's answer; a COUNTER's is taken as a proposal whatever its PARTSTAT says. */
  partstat: "ACCEPTED" | "DECLINED" | "TENTATIVE" | null;
  /** A COUNTER's proposed first day (its DTSTART's date, as written), "YYYY-MM-DD". */
  proposedStart: string | null;
  comment: string | null;
}

type Component = InstanceType<typeof ICAL.Component>;
type Property = InstanceType<typeof ICAL.Property>;

const answers = ["ACCEPTED", "DECLINED", "TENTATIVE"] as const;
// RFC 5546 §3.2.3 lists what a REPLY may hold: one kind of component, plus VTIMEZONE.
const otherKinds = ["vtodo", "vjournal", "vfreebusy"];

function mailtoAddress(prop: Property): string | null {
  const value = String(prop.getFirstValue() ?? "").trim();
  const m = /^mailto:(.+)$/i.exec(value);
  if (!m) return null;
  const address = decodeURIComponent(m[1]).trim().toLowerCase();
  return /^[^@\s]+@[^@\s]+$/.test(address) ? address : null;
}

/** Reads an iTIP REPLY to a booking invitation, or says in plain words why it cannot be used. */
export function parseItipReply(
  ics: string,
): { ok: true; reply: ParsedReply } | { ok: false; problem: string } {
  const fail = (problem: string) => ({ ok: false as const, problem });
  let root: Component;
  try {
    const jcal = ICAL.parse(ics);
    // Several top-level objects come back as an array of them; a reply is one VCALENDAR.
    if (Array.isArray(jcal[0]))
      return fail("The text holds more than one calendar object.");
    root = new ICAL.Component(jcal);
  } catch (err) {
    return fail(
      `The calendar text could not be read (${(err as Error).message}).`,
    );
  }
  if (root.name !== "vcalendar")
    return fail("The text is not an iCalendar object (no VCALENDAR).");

  // RFC 5546 §3.2.3: an answer to an invitation is METHOD:REPLY. Values of enumerated
  // properties are case-insensitive (RFC 5545 §2.1).
  const method = String(root.getFirstPropertyValue("method") ?? "")
    .trim()
    .toUpperCase();
  if (method !== "REPLY" && method !== "COUNTER")
    return fail(
      method
        ? `This is a ${method.toUpperCase()} message, not a reply to an invitation (METHOD:REPLY).`
        : "The calendar has no METHOD, so it is not a reply to an invitation (METHOD:REPLY).",
    );

  for (const kind of otherKinds)
    if (root.getAllSubcomponents(kind).length)
      return fail(
        `A reply to a booking holds one event, but this one holds a ${kind.toUpperCase()}.`,
      );
  const events = root.getAllSubcomponents("vevent");
  if (events.length !== 1)
    return fail(
      `A reply must hold exactly one event (VEVENT); this one holds ${events.length}.`,
    );
  const event = events[0];

  // RFC 5546 §3.2.3: the reply carries the request's UID, which is how it finds its booking.
  const uid = String(event.getFirstPropertyValue("uid") ?? "").trim();
  if (!uid)
    return fail("The reply has no UID, so it cannot be matched to a booking.");

  // RFC 5546 §3.2.3: SEQUENCE may be left out when it is 0, and is the request's otherwise.
  let sequence = 0;
  const seqProp = event.getFirstProperty("sequence");
  if (seqProp) {
    const raw = seqProp.getFirstValue();
    if (typeof raw !== "number" || !Number.isInteger(raw) || raw < 0)
      return fail(
        `The reply's SEQUENCE "${String(raw)}" is not a whole number.`,
      );
    sequence = raw;
  }

  // RFC 5546 §3.2.3: exactly one ATTENDEE, the one who is answering.
  const attendees = event.getAllProperties("attendee");
  if (attendees.length !== 1)
    return fail(
      attendees.length === 0
        ? "The reply names no attendee, so it is not clear who is answering."
        : `A reply must name exactly one attendee, the one answering; this one names ${attendees.length}.`,
    );
  const attendee = attendees[0];
  const attendeeEmail = mailtoAddress(attendee);
  if (!attendeeEmail)
    return fail("The attendee in the reply has no usable mailto: address.");

  const rawStat = attendee.getParameter("partstat");
  const stat = String(Array.isArray(rawStat) ? rawStat[0] : (rawStat ?? ""))
    .trim()
    .toUpperCase();
  const partstat = answers.find((a) => a === stat) ?? null;
  // RFC 5546 §3.2.7: a COUNTER's point is its new DTSTART; its PARTSTAT is not an answer.
  let proposedStart: string | null = null;
  if (method === "COUNTER") {
    const start = event.getFirstPropertyValue("dtstart");
    if (!(start instanceof ICAL.Time))
      return fail("The proposal (COUNTER) gives no new start (DTSTART).");
    const p2 = (n: number) => String(n).padStart(2, "0");
    proposedStart = `${start.year}-${p2(start.month)}-${p2(start.day)}`;
  } else if (!partstat)
    return fail(
      stat
        ? `The answer "${stat}" is not one Sitecue understands (accepted, declined or tentative).`
        : "The reply gives no answer (PARTSTAT) for the attendee.",
    );

  // RFC 5545 §3.8.1.4 COMMENT: what the trade typed alongside their answer, if anything.
  const comments = event
    .getAllProperties("comment")
    .map((p) => String(p.getFirstValue() ?? "").trim())
    .filter(Boolean);

  return {
    ok: true,
    reply: {
      method,
      uid,
      sequence,
      attendeeEmail,
      partstat,
      proposedStart,
      comment: comments.length ? comments.join("\n") : null,
    },
  };
}

/** Builds an iTIP REPLY the way a calendar app does (ical.js); used by tests and fakes. */
export function buildItipReply(input: {
  uid: string;
  sequence: number;
  organizerEmail: string;
  attendee: { name: string; email: string };
  partstat: "ACCEPTED" | "DECLINED" | "TENTATIVE";
  stamp: Date;
  comment?: string;
  /** A COUNTER ("Propose new time", RFC 5546 §3.2.7) for this first day, instead of a REPLY. */
  counterStart?: string;
}): string {
  const cal = new ICAL.Component(["vcalendar", [], []]);
  cal.addPropertyWithValue("prodid", "-//Sitecue//Test calendar app//EN");
  cal.addPropertyWithValue("version", "2.0");
  cal.addPropertyWithValue("method", input.counterStart ? "COUNTER" : "REPLY");

  const event = new ICAL.Component("vevent");
  event.addPropertyWithValue("uid", input.uid);
  // RFC 5546 §2.1.4: a reply never changes SEQUENCE; it echoes the request's.
  event.addPropertyWithValue("sequence", input.sequence);
  // RFC 5545 §3.8.7.2: DTSTAMP in UTC.
  event.addPropertyWithValue(
    "dtstamp",
    ICAL.Time.fromJSDate(input.stamp, true),
  );
  event.addPropertyWithValue("organizer", `mailto:${input.organizerEmail}`);
  const attendee = event.addPropertyWithValue(
    "attendee",
    `mailto:${input.attendee.email}`,
  );
  attendee.setParameter("partstat", input.partstat);
  // ical.js quotes a parameter value with : ; or , itself (RFC 5545 §3.2).
  if (input.attendee.name) attendee.setParameter("cn", input.attendee.name);
  if (input.comment) event.addPropertyWithValue("comment", input.comment);
  if (input.counterStart)
    event.addPropertyWithValue(
      "dtstart",
      ICAL.Time.fromDateString(input.counterStart),
    );
  cal.addSubcomponent(event);
  // ical.js writes CRLF and folds at 75 octets, like a calendar app (RFC 5545 §3.1).
  return cal.toString() + "\r\n";
}
