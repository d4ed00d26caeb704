// What a person's subscription feed holds (issue 6): exactly what the brief's roles table lets
// them see, as one PUBLISH calendar (RFC 5546 §3.2.1: ORGANIZER, no ATTENDEE).
import { partyTitle } from "../../../shared/words/trades";
import { createHash } from "node:crypto";
import ical, { ICalCalendarMethod } from "ical-generator";
import { tzlib_get_ical_block } from "timezones-ical-library";
import { In, Not, type EntityManager } from "typeorm";
import type { BookingState } from "../../../shared/schemas";
import { bookingStateTraits } from "../../../shared/bookings/lifecycle";
import { HttpError } from "../../http/errors";
import { bookingShowsAddress, type Actor } from "../../policies";
import { jobResources } from "../jobs/job-access";
import { Booking } from "../bookings/bookings.entity";
import { organizerAddress, whenWords } from "../bookings/booking-notices";
import { bookingCalendar, type BookingEventInput } from "../bookings/ical";
import { Job } from "../jobs/jobs.entity";
import {
  PINNING_STATES,
  loadProgrammes,
  type ProgrammeData,
} from "../programme/programme-input";
import { Task } from "../programme/programme.entity";
import { schedule } from "../programme/programme.service";
import { Trade } from "../trades/trades.entity";
import { Workshop } from "../workshops/workshops.entity";

/** RFC 7986 §5.7: calendar apps re-read the feed about this often. */
export const REFRESH_HOURS = 1;

export interface FeedContent {
  body: string;
  /** The latest change of anything in it (Last-Modified). */
  lastModified: Date;
}

const stateWords: Record<string, string> = {
  draft: "draft (not sent yet)",
  sent: "sent, waiting for an answer",
  confirmed: "confirmed",
  "date-proposed": "another date proposed",
  "needs-reconfirming": "needs re-confirming after a change",
};

/**
 * A stable UUID for a workshop task's event (RFC 7986 §5.3 wants a UUID that reveals nothing):
 * SHA-1 of a fixed namespace and the task id, shaped as a version-5 UUID (RFC 9562 §5.5).
 */
export function taskEventUid(taskId: string): string {
  const h = createHash("sha1").update(`sitecue:feed-task:${taskId}`).digest();
  h[6] = (h[6] & 0x0f) | 0x50;
  h[8] = (h[8] & 0x3f) | 0x80;
  const x = h.subarray(0, 16).toString("hex");
  return `${x.slice(0, 8)}-${x.slice(8, 12)}-${x.slice(12, 16)}-${x.slice(16, 20)}-${x.slice(20, 32)}`;
}

/** The event's times, as the invitation writes them (bookingIcs): the arrival time opens it. */
function bookingTimes(
  b: Booking,
  trade: Trade,
): Pick<BookingEventInput, "allDay" | "start" | "end"> {
  if (b.arrivalWindow === "all-day")
    return {
      allDay: true,
      start: b.start.slice(0, 10),
      end: b.finish.slice(0, 10),
    };
  const arrival =
    b.arrivalWindow === "range" && b.arrivalFrom
      ? b.arrivalFrom
      : b.arrivalWindow === "afternoon"
        ? "12:00"
        : b.start.slice(11, 16) || trade.dayStart;
  const opens = `${b.start.slice(0, 10)}T${arrival}`;
  return {
    allDay: false,
    start: opens < b.finish ? opens : b.start,
    end: b.finish,
  };
}

/**
 * A booking's STATUS in a feed, from the lifecycle table: confirmed only once the trade confirmed;
 * a draft (only in the workshop's own feed) is tentative too.
 */
const feedStatus = (state: BookingState) =>
  bookingStateTraits[state].status ?? "TENTATIVE";

const address = (job: Job) => `${job.siteAddress}, ${job.postcode}`;
const later = (a: Date, b: Date) => (a > b ? a : b);

interface Loaded {
  bookings: Booking[];
  jobs: Map<string, Job>;
  tasks: Map<string, Task>;
  trades: Map<string, Trade>;
  workshops: Map<string, Workshop>;
}

async function loadAround(
  m: EntityManager,
  bookings: Booking[],
  extraJobIds: string[] = [],
): Promise<Loaded> {
  const jobIds = [
    ...new Set([...bookings.map((b) => b.jobId), ...extraJobIds]),
  ];
  const taskIds = [...new Set(bookings.map((b) => b.taskId))];
  const tradeIds = [...new Set(bookings.map((b) => b.tradeId))];
  const [jobs, tasks, trades] = await Promise.all([
    jobIds.length ? m.findBy(Job, { id: In(jobIds) }) : [],
    taskIds.length ? m.findBy(Task, { id: In(taskIds) }) : [],
    tradeIds.length ? m.findBy(Trade, { id: In(tradeIds) }) : [],
  ]);
  const wsIds = [...new Set(jobs.map((j) => j.workshopId))];
  const workshops = wsIds.length
    ? await m.findBy(Workshop, { id: In(wsIds) })
    : [];
  return {
    bookings,
    jobs: new Map(jobs.map((j) => [j.id, j])),
    tasks: new Map(tasks.map((t) => [t.id, t])),
    trades: new Map(trades.map((t) => [t.id, t])),
    workshops: new Map(workshops.map((w) => [w.id, w])),
  };
}

interface Collected {
  events: BookingEventInput[];
  lastModified: Date;
}

/**
 * Events for a job's tasks the engine plans (the workshop's own), on their planned dates, in the
 * words `wordsOf` gives: one rule for the workshop's feed and the customer's. A programme the
 * engine refuses (a loop saved before the check existed…) must not take the whole feed down:
 * that job's tasks are left out until it is fixed. Planned dates move with "today" (the engine's
 * data date), so the feed's Last-Modified moves daily too.
 */
function plannedTaskEvents(
  ctx: {
    job: Job;
    ws: Workshop;
    data: ProgrammeData;
    now: Date;
    calendarAddress: string;
  },
  which: (t: Task) => boolean,
  wordsOf: (t: Task) => { summary: string; description: string[] },
  add: (e: BookingEventInput, changed: Date) => void,
  out: Collected,
): void {
  const { job, ws, data, now } = ctx;
  const own = data.tasks.filter(which);
  if (!own.length) return;
  let result;
  try {
    result = schedule(data.input);
  } catch (err) {
    if (err instanceof HttpError && err.status === 422) return;
    throw err;
  }
  out.lastModified = later(
    out.lastModified,
    new Date(
      Math.min(now.getTime(), Date.parse(`${data.input.dataDate}T00:00:00Z`)),
    ),
  );
  const planned = new Map(result.tasks.map((r) => [r.id, r]));
  for (const t of own) {
    const r = planned.get(t.id);
    if (!r) continue;
    const timed = r.plannedFinish > r.plannedStart;
    const words = wordsOf(t);
    add(
      {
        method: "PUBLISH",
        uid: taskEventUid(t.id),
        // The job's version goes up with every programme edit, so it never goes down (RFC 5546 §2.1.4).
        sequence: Math.max(0, job.version - 1),
        stamp: later(t.updatedAt, job.updatedAt),
        organizer: { name: ws.name, email: ctx.calendarAddress },
        summary: words.summary,
        description: words.description.filter(Boolean).join("\n"),
        location: address(job),
        timeZone: job.timeZone,
        allDay: !timed,
        start: timed ? r.plannedStart : r.plannedStart.slice(0, 10),
        end: timed ? r.plannedFinish : r.plannedStart.slice(0, 10),
        alarmEveningBefore: false,
      },
      later(t.updatedAt, job.updatedAt),
    );
  }
}

/** Builds the feed of everything `actor` may see, for the person `name`. */
export async function feedContent(
  m: EntityManager,
  deps: { replyDomain: string },
  actor: Actor,
  name: string,
  feedCreatedAt: Date,
  now = new Date(),
): Promise<FeedContent> {
  const out: Collected = { events: [], lastModified: feedCreatedAt };
  const seen = new Set<string>();
  const add = (e: BookingEventInput, changed: Date) => {
    if (seen.has(e.uid)) return;
    seen.add(e.uid);
    out.events.push(e);
    out.lastModified = later(out.lastModified, changed);
  };
  const calendarAddress = `calendar@${deps.replyDomain}`;

  // Workshop members: everything of their workshop(s) — first, so the fullest view of a booking wins.
  const workshopIds = [...actor.memberships.keys()];
  if (workshopIds.length) {
    const bookings = await m.find(Booking, {
      where: {
        workshopId: In(workshopIds),
        state: Not(In(["cancelled", "declined"])),
      },
      order: { start: "ASC" },
    });
    const openJobs = await m.find(Job, {
      where: { workshopId: In(workshopIds), status: Not("cancelled") },
    });
    const l = await loadAround(
      m,
      bookings,
      openJobs.map((j) => j.id),
    );
    for (const b of bookings) {
      const job = l.jobs.get(b.jobId);
      const task = l.tasks.get(b.taskId);
      const trade = l.trades.get(b.tradeId);
      const ws = job && l.workshops.get(job.workshopId);
      if (!job || !task || !trade || !ws) continue;
      add(
        {
          method: "PUBLISH",
          uid: b.icalUid,
          sequence: b.sequence,
          stamp: b.updatedAt,
          organizer: {
            name: ws.name,
            email: organizerAddress(deps.replyDomain, b.id),
          },
          summary: `${task.name}: ${trade.businessName} — ${job.title}`,
          description: [
            `${partyTitle(trade.kind)}: ${trade.businessName} (${trade.contactName}, ${trade.phone}).`,
            `When: ${whenWords(b)}.`,
            `Booking: ${stateWords[b.state] ?? b.state}.`,
            task.internalNote ? `Workshop note: ${task.internalNote}` : "",
          ]
            .filter(Boolean)
            .join("\n"),
          location: address(job),
          timeZone: job.timeZone,
          ...bookingTimes(b, trade),
          alarmEveningBefore: false,
          status: feedStatus(b.state),
        },
        later(b.updatedAt, task.updatedAt),
      );
    }
    // The workshop's own tasks, on the dates the programme engine plans for them; every job's
    // programme input loaded at once, in a fixed number of statements (issue 15).
    const inputs = await loadProgrammes(
      m,
      openJobs.filter((j) => l.workshops.has(j.workshopId)),
      [...l.workshops.values()],
      now,
    );
    for (const job of openJobs) {
      const ws = l.workshops.get(job.workshopId);
      const data = inputs.get(job.id);
      if (!ws || !data) continue;
      plannedTaskEvents(
        { job, ws, data, now, calendarAddress },
        (t) => t.party === "workshop",
        (t) => ({
          summary: `${t.name} — ${job.title}`,
          description: [
            `Workshop task for ${job.title}.`,
            t.internalNote ? `Workshop note: ${t.internalNote}` : "",
          ],
        }),
        add,
        out,
      );
    }
  }

  // A trade: their own bookings in every workshop; the full address only once confirmed or shared.
  const tradeIds = [...actor.trades.keys()];
  if (tradeIds.length) {
    const bookings = await m.find(Booking, {
      where: { tradeId: In(tradeIds), state: In([...PINNING_STATES]) },
      order: { start: "ASC" },
    });
    const l = await loadAround(m, bookings);
    const resources = await jobResources(m, [...l.jobs.values()]);
    for (const b of bookings) {
      const job = l.jobs.get(b.jobId);
      const task = l.tasks.get(b.taskId);
      const trade = l.trades.get(b.tradeId);
      const ws = job && l.workshops.get(job.workshopId);
      const resource = job && resources.get(job.id);
      if (!job || !task || !trade || !ws || !resource) continue;
      const showAddress = bookingShowsAddress(b, resource);
      add(
        {
          method: "PUBLISH",
          uid: b.icalUid,
          sequence: b.sequence,
          stamp: b.updatedAt,
          organizer: {
            name: ws.name,
            email: organizerAddress(deps.replyDomain, b.id),
          },
          // The same words as the invitation, so the two read alike in the trade's calendar.
          summary: `${task.name} — ${job.area}`,
          description: [
            `${ws.name}: ${task.name} for ${job.title}.`,
            `When: ${whenWords(b)}.`,
            `Booking: ${stateWords[b.state] ?? b.state}.`,
            showAddress && job.accessNotes ? `Access: ${job.accessNotes}` : "",
            showAddress ? "" : "The full address comes once you confirm.",
          ]
            .filter(Boolean)
            .join("\n"),
          location: showAddress ? address(job) : job.area,
          timeZone: job.timeZone,
          ...bookingTimes(b, trade),
          alarmEveningBefore: false,
          status: feedStatus(b.state),
        },
        b.updatedAt,
      );
    }
  }

  // A customer: the visits on their own job(s) — who, when, what to prepare; nothing internal.
  const customerIds = [...actor.customers.keys()];
  if (customerIds.length) {
    const jobs = await m.findBy(Job, { customerId: In(customerIds) });
    const bookings = jobs.length
      ? await m.find(Booking, {
          where: {
            jobId: In(jobs.map((j) => j.id)),
            state: In([...PINNING_STATES]),
          },
          order: { start: "ASC" },
        })
      : [];
    const l = await loadAround(
      m,
      bookings,
      jobs.map((j) => j.id),
    );
    for (const b of bookings) {
      const job = l.jobs.get(b.jobId);
      const task = l.tasks.get(b.taskId);
      const trade = l.trades.get(b.tradeId);
      const ws = job && l.workshops.get(job.workshopId);
      if (!job || !task || !trade || !ws) continue;
      add(
        {
          method: "PUBLISH",
          uid: b.icalUid,
          sequence: b.sequence,
          stamp: b.updatedAt,
          organizer: { name: ws.name, email: calendarAddress },
          summary: `${partyTitle(trade.kind)}: ${trade.businessName}`,
          description: [
            `${task.name}, ${whenWords(b)}.`,
            task.customerNote ? `To prepare: ${task.customerNote}` : "",
            b.state === "confirmed"
              ? ""
              : "Not confirmed yet: the date may change.",
          ]
            .filter(Boolean)
            .join("\n"),
          location: address(job),
          timeZone: job.timeZone,
          ...bookingTimes(b, trade),
          alarmEveningBefore: false,
          status: feedStatus(b.state),
        },
        later(b.updatedAt, task.updatedAt),
      );
    }
    // The workshop's own visits too, as her timeline lists them (issue 16: the feed held 5 of her
    // 8 visits, never when the joiners are in her house): its on-site tasks at the planned dates.
    const live = jobs.filter(
      (j) => j.status !== "cancelled" && l.workshops.has(j.workshopId),
    );
    const inputs = await loadProgrammes(
      m,
      live,
      [...l.workshops.values()],
      now,
    );
    for (const job of live) {
      const data = inputs.get(job.id);
      if (!data) continue;
      const ws = l.workshops.get(job.workshopId)!;
      plannedTaskEvents(
        { job, ws, data, now, calendarAddress },
        (t) => t.party === "workshop" && Number(t.durationDays) > 0,
        (t) => ({
          summary: `${ws.name}: ${t.name}`,
          description: [
            `${ws.name} on site: ${t.name}.`,
            t.customerNote ? `To prepare: ${t.customerNote}` : "",
            "Planned dates: they move if the work before them does.",
          ],
        }),
        add,
        out,
      );
    }
  }

  const calName = `Sitecue: ${name}`;
  return {
    body: writtenFeed(calName, out.events),
    lastModified: out.lastModified,
  };
}

/**
 * Written feeds by what went into them. Writing the iCalendar text is most of a feed's cost
 * (ical-generator and luxon, about 200 ms for a 53-job workshop's 200 events), and calendar apps
 * re-read an unchanged feed every hour: the same events give the same text, so it is written once.
 * Keyed by a SHA-256 of the events themselves, so any change to any event writes it afresh.
 */
const written = new Map<string, string>();
const WRITTEN_KEEP = 64;

function writtenFeed(calName: string, events: BookingEventInput[]): string {
  const key = createHash("sha256")
    .update(JSON.stringify([calName, REFRESH_HOURS, events]))
    .digest("base64");
  const hit = written.get(key);
  if (hit !== undefined) {
    // Most recently used last, so the oldest is the first to go.
    written.delete(key);
    written.set(key, hit);
    return hit;
  }
  const body = events.length
    ? bookingCalendar(events, {
        name: calName,
        refreshIntervalHours: REFRESH_HOURS,
      })
    : emptyCalendar(calName);
  written.set(key, body);
  if (written.size > WRITTEN_KEEP) written.delete(written.keys().next().value!);
  return body;
}

/**
 * A feed with nothing in it yet. bookingCalendar refuses an empty calendar because RFC 5545 §3.6
 * wants at least one component, so this one carries the Europe/London VTIMEZONE as that component.
 */
function emptyCalendar(name: string): string {
  const cal = ical({
    prodId: { company: "Sitecue", product: "Bookings", language: "EN" },
    method: ICalCalendarMethod.PUBLISH,
  });
  cal.name(name.replace(/[\\;,]/g, (c) => "\\" + c).replace(/\r?\n/g, "\\n"));
  cal.ttl(REFRESH_HOURS * 3600);
  cal.timezone({
    name: "Europe/London",
    generator: (tz) => {
      const block = tzlib_get_ical_block(tz);
      return Array.isArray(block) ? block[0] : "";
    },
  });
  return cal.toString() + "\r\n";
}
