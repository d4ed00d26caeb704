// iCalendar (RFC 5545) objects for bookings: iTIP invitations and cancellations (RFC 5546) carried
// by e-mail (RFC 6047), and PUBLISH objects for subscription feeds. ical-generator writes the text
// (escaping per §3.3.11 and folding per §3.1); timezones-ical-library supplies the VTIMEZONE blocks.
// Everything that ical-generator 10 gets subtly wrong for us is handled here, with the reason.
import ical, {
  ICalAlarmType,
  ICalAttendeeRole,
  ICalAttendeeStatus,
  ICalCalendarMethod,
  ICalEventStatus,
} from "ical-generator";
import { DateTime } from "luxon";
import {
  tzlib_get_ical_block,
  tzlib_get_timezones,
} from "timezones-ical-library";

/** A trade's answer as written in ATTENDEE;PARTSTAT (RFC 5545 §3.2.12). */
export type PartStat = "NEEDS-ACTION" | "ACCEPTED" | "DECLINED" | "TENTATIVE";

/** One booking as an event: what bookingCalendar needs to write it. */
export interface BookingEventInput {
  method: "REQUEST" | "CANCEL" | "PUBLISH";
  /** Random UUID per booking (RFC 7986 §5.3), the same across updates. */
  uid: string;
  /** RFC 5546 §2.1.4; the caller decides when it goes up. */
  sequence: number;
  /** DTSTAMP, written in UTC (RFC 5545 §3.8.7.2). */
  stamp: Date;
  /** A Sitecue reply address for that booking. */
  organizer: { name: string; email: string };
  /** Omitted for PUBLISH (RFC 5546 §3.2.1). */
  attendee?: { name: string; email: string; partstat: PartStat };
  summary: string;
  description: string;
  location: string;
  url?: string;
  /** IANA name, e.g. Europe/London. */
  timeZone: string;
  allDay: boolean;
  /** Local "YYYY-MM-DD" (allDay) or "YYYY-MM-DDTHH:mm". */
  start: string;
  /** allDay: the last day, inclusive, "YYYY-MM-DD"; timed: the local end "YYYY-MM-DDTHH:mm". */
  end: string;
  /** A display alarm at 18:00 local the evening before the start. */
  alarmEveningBefore: boolean;
  /**
   * STATUS (RFC 5545 §3.8.1.11) for a PUBLISH feed's event: the booking lifecycle's status for its
   * state, so a visit the trade has not confirmed reads TENTATIVE. Omitted: CONFIRMED (CANCELLED
   * for a CANCEL).
   */
  status?: "TENTATIVE" | "CONFIRMED" | "CANCELLED";
}

const uuidPattern =
  /^[0-9a-f]{8}-[0-9a-f]{4}-[1-8][0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/i;
const datePattern = /^\d{4}-\d{2}-\d{2}$/;
const dateTimePattern = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/;
const utcNames = new Set(["UTC", "Etc/UTC", "Etc/GMT", "GMT"]);

let knownZones: Set<string> | null = null;
/** Each zone's VTIMEZONE text, made once: the library rebuilds it on every call (issue 15, feeds). */
const zoneBlocks = new Map<string, string>();

function zoneBlock(tz: string): string {
  const made = zoneBlocks.get(tz);
  if (made) return made;
  knownZones ??= new Set(
    (() => {
      const list = tzlib_get_timezones();
      return typeof list === "string" ? (JSON.parse(list) as string[]) : list;
    })(),
  );
  // Ask only for zones the library has: for others it writes to the console and returns "".
  const block = knownZones.has(tz) ? tzlib_get_ical_block(tz) : "";
  const text = Array.isArray(block) ? block[0] : "";
  if (!text) throw new Error(`No time-zone definition (VTIMEZONE) for "${tz}"`);
  zoneBlocks.set(tz, text);
  return text;
}

/**
 * The zone's canonical name, as the VTIMEZONE spells its TZID: the library answers a link such
 * as "GB" with the block for Europe/London, so writing TZID=GB would leave it undefined.
 */
function canonicalZone(tz: string): string {
  const m = /\r\nTZID:([^\r\n]+)\r\n/.exec(zoneBlock(tz));
  if (!m) throw new Error(`No TZID in the time-zone definition for "${tz}"`);
  return m[1];
}

function vtimezoneFor(tz: string): string {
  const text = zoneBlock(tz);
  // RFC 5545 §3.2.19: every TZID used must have a VTIMEZONE with that exact TZID.
  if (!text.includes(`\r\nTZID:${tz}\r\n`))
    throw new Error(`The time-zone definition for "${tz}" has another TZID`);
  return text;
}

/**
 * RFC 5545 §3.2: a parameter value (CN) cannot hold a DQUOTE, and inside a quoted value a
 * backslash is literal (ical-generator would double it, which readers keep as two). RFC 6868
 * gives the portable spelling: ^' for DQUOTE, ^n for a newline, ^^ for a caret.
 */
function paramText(name: string): string {
  return name
    .replace(/\\/g, "")
    .replace(/\^/g, "^^")
    .replace(/"/g, "^'")
    .replace(/\r\n|\r|\n/g, "^n")
    .replace(/[\x00-\x08\x0a-\x1f\x7f]/g, " ") // eslint-disable-line no-control-regex
    .trim();
}

/** RFC 5545 §3.3.11 TEXT escaping, for the calendar NAME which ical-generator writes raw. */
function escapeText(value: string): string {
  return value
    .replace(/[\\;,]/g, (m) => "\\" + m)
    .replace(/\r\n|\r|\n/g, "\\n");
}

function localDate(value: string, what: string): DateTime {
  if (!datePattern.test(value))
    throw new Error(`${what} must be a date "YYYY-MM-DD", got "${value}"`);
  // All-day dates are floating (RFC 5545 §3.3.4): held in UTC only so that nothing shifts them.
  const d = DateTime.fromISO(value, { zone: "utc" });
  if (!d.isValid) throw new Error(`${what} is not a real date: "${value}"`);
  return d;
}

function localDateTime(value: string, zone: string, what: string): DateTime {
  if (!dateTimePattern.test(value))
    throw new Error(
      `${what} must be a local time "YYYY-MM-DDTHH:mm", got "${value}"`,
    );
  const d = DateTime.fromISO(value, { zone });
  if (!d.isValid) throw new Error(`${what} is not a real time: "${value}"`);
  // A wall-clock time skipped by a daylight-saving change (e.g. 01:30 on the last Sunday of
  // March in London) does not exist; luxon would quietly move it an hour.
  if (d.toFormat("yyyy-MM-dd'T'HH:mm") !== value)
    throw new Error(`${what} ${value} does not exist in ${zone}`);
  return d;
}

function checkInput(e: BookingEventInput): void {
  // RFC 7986 §5.3: the UID should be a random UUID, so it reveals no user, host or booking id.
  if (!uuidPattern.test(e.uid))
    throw new Error(`uid must be a UUID, got "${e.uid}"`);
  if (!Number.isInteger(e.sequence) || e.sequence < 0)
    throw new Error(
      `sequence must be a whole number from 0, got ${e.sequence}`,
    );
  if (!(e.stamp instanceof Date) || Number.isNaN(e.stamp.getTime()))
    throw new Error("stamp must be a valid Date");
  // RFC 5546 §3.2.1: a PUBLISH has no ATTENDEE; §3.2.2 and §3.2.5: REQUEST and CANCEL have one.
  if (e.method === "PUBLISH" && e.attendee)
    throw new Error("A PUBLISH event carries no attendee (RFC 5546 §3.2.1)");
  if (e.method !== "PUBLISH" && !e.attendee)
    throw new Error(
      `A ${e.method} needs the attendee it is sent to (RFC 5546 §3.2.2, §3.2.5)`,
    );
  if (!DateTime.local().setZone(e.timeZone).isValid)
    throw new Error(`Unknown time zone "${e.timeZone}"`);
}

/** Seconds from the alarm (18:00 local the evening before) to the start. */
function secondsBeforeStart(e: BookingEventInput, start: DateTime): number {
  if (e.allDay) {
    // An all-day start is local midnight (floating), so 18:00 the evening before is always six
    // hours earlier on the same wall clock; UK clock changes happen after midnight, never across.
    return 6 * 3600;
  }
  // RFC 5545 §3.3.6: hours in a duration are exact, so across a clock change the trigger must be
  // the real elapsed time between the two instants, not the wall-clock difference.
  const alarm = start
    .minus({ days: 1 })
    .set({ hour: 18, minute: 0, second: 0, millisecond: 0 });
  return Math.round(start.diff(alarm, "seconds").seconds);
}

/** Builds the .ics text for one booking (REQUEST/CANCEL) or several (a PUBLISH feed). */
export function bookingCalendar(
  events: BookingEventInput[] | BookingEventInput,
  opts: { name?: string; refreshIntervalHours?: number } = {},
): string {
  const list = Array.isArray(events) ? events : [events];
  if (list.length === 0) throw new Error("A calendar needs at least one event");
  const method = list[0].method;
  // METHOD is a property of the whole calendar object (RFC 5545 §3.7.2), so every event shares it.
  if (list.some((e) => e.method !== method))
    throw new Error("All events in one calendar must have the same method");
  // A scheduling message (REQUEST, CANCEL) is about one booking; only a feed holds several.
  if (method !== "PUBLISH" && list.length > 1)
    throw new Error(`A ${method} carries one booking, got ${list.length}`);
  const uids = new Set<string>();
  for (const e of list) {
    checkInput(e);
    if (uids.has(e.uid)) throw new Error(`Duplicate uid ${e.uid}`);
    uids.add(e.uid);
  }

  const cal = ical({
    prodId: { company: "Sitecue", product: "Bookings", language: "EN" },
    method: ICalCalendarMethod[method],
  });
  // No calendar-wide zone name: with one, ical-generator writes DTSTAMP as local time, which
  // RFC 5545 §3.8.7.2 forbids. The generator alone emits a VTIMEZONE for each event's TZID.
  cal.timezone({ name: null, generator: vtimezoneFor });
  // RFC 7986 §5.1 NAME is TEXT; ical-generator writes it (and X-WR-CALNAME) unescaped.
  if (opts.name) cal.name(escapeText(opts.name));
  // RFC 7986 §5.7 REFRESH-INTERVAL;VALUE=DURATION (ical-generator's ttl; X-PUBLISHED-TTL too).
  if (opts.refreshIntervalHours !== undefined) {
    if (!(opts.refreshIntervalHours > 0))
      throw new Error("refreshIntervalHours must be more than 0");
    cal.ttl(Math.round(opts.refreshIntervalHours * 3600));
  }

  for (const e of list) {
    const utc = utcNames.has(e.timeZone);
    let start: DateTime;
    let end: DateTime;
    if (e.allDay) {
      start = localDate(e.start, "start");
      const lastDay = localDate(e.end, "end");
      if (lastDay < start)
        throw new Error(`end ${e.end} is before start ${e.start}`);
      // RFC 5545 §3.6.1 and §3.8.2.2: DTEND is exclusive, the day after the last day.
      end = lastDay.plus({ days: 1 });
    } else {
      start = localDateTime(e.start, e.timeZone, "start");
      end = localDateTime(e.end, e.timeZone, "end");
      if (end <= start)
        throw new Error(`end ${e.end} is not after start ${e.start}`);
    }

    const event = cal.createEvent({
      id: e.uid,
      sequence: e.sequence,
      stamp: e.stamp,
      allDay: e.allDay,
      start,
      end,
      // Timed events are local times with a TZID and its VTIMEZONE (RFC 5545 §3.3.5 form 3), so
      // a trade's calendar keeps 08:00 at 08:00 whatever zone their phone is in. UTC is written
      // as UTC (form 2). All-day dates carry no zone at all.
      timezone: e.allDay || utc ? null : canonicalZone(e.timeZone),
      summary: e.summary,
      description: e.description || null,
      location: e.location || null,
      url: e.url ?? null,
      // RFC 5546 §3.2.5: a CANCEL has STATUS:CANCELLED; a live booking is CONFIRMED.
      status:
        e.method === "CANCEL"
          ? ICalEventStatus.CANCELLED
          : e.status
            ? ICalEventStatus[e.status]
            : ICalEventStatus.CONFIRMED,
      organizer: {
        name: paramText(e.organizer.name),
        email: e.organizer.email,
      },
    });
    if (e.attendee) {
      event.createAttendee({
        name: paramText(e.attendee.name) || null,
        email: e.attendee.email,
        // RFC 5545 §3.2.17 and §3.2.16: we want an answer, from a required participant. A CANCEL
        // expects none (RFC 5546 §3.2.5), so it asks for none.
        rsvp: e.method === "REQUEST" ? true : null,
        role: ICalAttendeeRole.REQ,
        status: e.attendee.partstat as ICalAttendeeStatus,
      });
    }
    if (e.alarmEveningBefore && e.method !== "CANCEL") {
      // A relative trigger (RFC 5545 §3.8.6.3) rather than an absolute one: ical-generator would
      // write an absolute trigger as local time, but the RFC requires it in UTC.
      event.createAlarm({
        type: ICalAlarmType.display,
        triggerBefore: secondsBeforeStart(e, start),
        // RFC 5545 §3.6.6: a DISPLAY alarm must have a DESCRIPTION.
        description: `Tomorrow: ${e.summary}`,
      });
    }
  }
  // RFC 5545 §3.1: every content line ends with CRLF, the last one too.
  return cal.toString() + "\r\n";
}

/** The nodemailer fields that carry an iCalendar object in an invitation or cancellation e-mail. */
export function invitationMailParts(
  ics: string,
  method: "REQUEST" | "CANCEL" | "PUBLISH",
): {
  icalEvent: { method: string; content: string; filename: string };
  attachments: never[];
} {
  const written = /^METHOD:([^\r\n]*)\r?$/im.exec(ics)?.[1]?.trim();
  // RFC 6047 §2.4: the Content-Type method parameter must equal the object's METHOD.
  if (written?.toUpperCase() !== method)
    throw new Error(
      `The calendar says METHOD:${written ?? "(none)"} but the e-mail would say ${method}`,
    );
  return {
    // nodemailer writes this twice: as a `text/calendar; charset=utf-8; method=…` alternative
    // beside the text and HTML bodies (RFC 6047 §2.4), and as an "invite.ics" attachment
    // (application/ics, base64). So no attachment of our own: it would be a third copy.
    icalEvent: { method, content: ics, filename: "invite.ics" },
    attachments: [],
  };
}
