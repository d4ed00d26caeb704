import {
  bookingStateTraits,
  stateIs,
  type BookingMailKind,
} from "../../../shared/bookings/lifecycle";
import type { EntityManager } from "typeorm";
import type { BookingState } from "../../../shared/schemas";
import { enqueueMail } from "../../infra/outbox/outbox";
import { escapeHtml } from "../auth/auth.service";
import type { Job } from "../jobs/jobs.entity";
import type { Task } from "../programme/programme.entity";
import type { Trade } from "../trades/trades.entity";
import { WorkshopMember, type Workshop } from "../workshops/workshops.entity";
import type { Booking } from "./bookings.entity";
import { bookingCalendar, type PartStat } from "./ical";

export interface NoticeContext {
  appUrl: string;
  replyDomain: string;
  workshop: Workshop;
  job: Job;
  task: Task;
  trade: Trade;
  /** Where the task stands: "waits for Fix carcasses & scribes (planned to finish Wed 4 Mar)". */
  waitsOn: string[];
  link: string | null;
  /** Whether the trade may see the full address now. */
  showAddress: boolean;
}

const weekday = new Intl.DateTimeFormat("en-GB", {
  weekday: "short",
  day: "numeric",
  month: "short",
  year: "numeric",
  timeZone: "UTC",
});

/** "Thu 5 Mar 2026" for a local date or date-time. */
export function dayWords(local: string): string {
  return weekday
    .format(new Date(`${local.slice(0, 10)}T12:00:00Z`))
    .replace(",", "");
}

/** The booking's days and arrival window in words. */
export function whenWords(
  b: Pick<
    Booking,
    "start" | "finish" | "arrivalWindow" | "arrivalFrom" | "arrivalTo"
  >,
): string {
  const first = dayWords(b.start);
  const last = dayWords(b.finish);
  const days = first === last ? first : `${first} to ${last}`;
  const arrival =
    b.arrivalWindow === "morning"
      ? "arriving in the morning"
      : b.arrivalWindow === "afternoon"
        ? "arriving in the afternoon"
        : b.arrivalWindow === "range"
          ? `arriving ${b.arrivalFrom}–${b.arrivalTo}`
          : "all day";
  return `${days}, ${arrival}`;
}

/** The reply address for one booking: iTIP REPLYs from the trade's calendar app come back here. */
export function organizerAddress(
  replyDomain: string,
  bookingId: string,
): string {
  return `booking-${bookingId}@${replyDomain}`;
}

/** The trade's PARTSTAT in the invitation, from the lifecycle table (RFC 5545 §3.2.12). */
function partstat(b: Booking): PartStat {
  return bookingStateTraits[b.state].partstat ?? "NEEDS-ACTION";
}

/** The iCalendar object for a booking (RFC 5545/5546): REQUEST while it stands, CANCEL when withdrawn. */
export function bookingIcs(
  ctx: NoticeContext,
  b: Booking,
  method: "REQUEST" | "CANCEL",
): string {
  const allDay = b.arrivalWindow === "all-day";
  const arrivalStart =
    b.arrivalWindow === "range" && b.arrivalFrom
      ? b.arrivalFrom
      : b.arrivalWindow === "afternoon"
        ? "12:00"
        : b.start.slice(11, 16) || ctx.trade.dayStart;
  return bookingCalendar({
    method,
    uid: b.icalUid,
    sequence: b.sequence,
    stamp: new Date(),
    organizer: {
      name: ctx.workshop.name,
      email: organizerAddress(ctx.replyDomain, b.id),
    },
    attendee: {
      name: ctx.trade.businessName,
      email: ctx.trade.email,
      partstat: partstat(b),
    },
    summary: `${ctx.task.name} — ${ctx.job.area}`,
    description: [
      `${ctx.workshop.name}: ${ctx.task.name} for ${ctx.job.title}.`,
      `When: ${whenWords(b)}.`,
      ...ctx.waitsOn.map((w) => `Waits for ${w}.`),
      ctx.link ? `Confirm, decline or propose another start: ${ctx.link}` : "",
    ]
      .filter(Boolean)
      .join("\n"),
    location: ctx.showAddress
      ? `${ctx.job.siteAddress}, ${ctx.job.postcode}`
      : ctx.job.area,
    url: ctx.link ?? undefined,
    timeZone: ctx.job.timeZone,
    allDay,
    // The arrival time opens the event, unless it would leave none of the booked time.
    start: allDay
      ? b.start.slice(0, 10)
      : `${b.start.slice(0, 10)}T${arrivalStart}` < b.finish
        ? `${b.start.slice(0, 10)}T${arrivalStart}`
        : b.start,
    end: allDay ? b.finish.slice(0, 10) : b.finish,
    alarmEveningBefore: method === "REQUEST",
  });
}

type Kind = BookingMailKind;

/** What an e-mail adds to its standard words: the workshop's own note, or what happened. */
export interface MailWords {
  /** Typed by someone at the workshop (a reason to cancel, a word with an answer). */
  note?: string;
  /** What the system did and why, in its own voice (never presented as the workshop's note). */
  why?: string;
  /** The local date the e-mail goes out ("today" for a reminder's "Tomorrow"). */
  today?: string;
}

/** "Tomorrow" when the visit is the calendar day after `today`, else "On Mon 7 Dec". */
function whenDayWords(start: string, today: string | undefined): string {
  const d = new Date(`${start.slice(0, 10)}T12:00:00Z`);
  if (today) {
    const next = new Date(`${today}T12:00:00Z`);
    next.setUTCDate(next.getUTCDate() + 1);
    if (next.toISOString().slice(0, 10) === start.slice(0, 10))
      return "Tomorrow";
  }
  return `On ${dayWords(d.toISOString())}`;
}

const subjects: Record<
  Kind,
  (c: NoticeContext, b: Booking, w: MailWords) => string
> = {
  invitation: (c) =>
    `${c.workshop.name}: can you do ${c.task.name} at ${c.job.area}?`,
  // After a move the trade confirms again; after the workshop accepts their own proposal it is settled.
  updated: (c, b) =>
    stateIs(b.state, "chaseable")
      ? `${c.workshop.name}: new dates for ${c.task.name} at ${c.job.area}, please confirm again`
      : `${c.workshop.name}: ${c.task.name} at ${c.job.area} is confirmed for ${dayWords(b.start)}`,
  chase: (c) =>
    `${c.workshop.name}: please answer for ${c.task.name} at ${c.job.area}`,
  cancel: (c) =>
    `${c.workshop.name}: ${c.task.name} at ${c.job.area} is cancelled`,
  // The day in words unless it really is tomorrow (a Monday visit reminded on Friday says Monday).
  reminder: (c, b, w) =>
    `${whenDayWords(b.start, w.today)}: ${c.task.name} at ${c.job.area} for ${c.workshop.name}`,
  "proposal-rejected": (c) =>
    `${c.workshop.name}: your proposed date for ${c.task.name} doesn't work`,
};

/** The e-mail's opening line, by kind and by where the booking now stands. */
function opening(ctx: NoticeContext, b: Booking, kind: Kind): string {
  const at = `${ctx.task.name} at ${ctx.job.area}`;
  switch (kind) {
    case "cancel":
      return `${ctx.workshop.name} has cancelled ${at} (${whenWords(b)}). Nothing more to do.`;
    case "reminder":
      return `A reminder of your visit for ${ctx.workshop.name}: ${at}, ${whenWords(b)}.`;
    case "updated":
      return stateIs(b.state, "chaseable")
        ? `The dates for ${at} have changed: now ${whenWords(b)}. Please confirm again.`
        : `${at} is confirmed for ${whenWords(b)}. Nothing more to do.`;
    case "proposal-rejected":
      return `${ctx.workshop.name} can't take your proposed date for ${ctx.task.name}. The booking stays ${whenWords(b)}: please confirm it, or propose another start.`;
    case "chase":
      return `${ctx.workshop.name} is still waiting for your answer for ${at}: ${whenWords(b)}.`;
    case "invitation":
      return `${ctx.workshop.name} would like to book you for ${at}: ${whenWords(b)}.`;
  }
}

/** Writes a booking e-mail with its calendar part to the outbox, in the caller's transaction. */
export async function queueBookingMail(
  m: EntityManager,
  ctx: NoticeContext,
  b: Booking,
  kind: Kind,
  words: MailWords = {},
): Promise<void> {
  const method = kind === "cancel" ? "CANCEL" : "REQUEST";
  // Still waiting for their answer: the link and the calendar app's buttons answer it. Confirmed:
  // the link is for saying they can't make it after all. Cancelled: nothing to answer.
  const awaitsAnswer = kind !== "cancel" && b.state !== "confirmed";
  const lines = [
    `Hello ${ctx.trade.contactName},`,
    "",
    opening(ctx, b, kind),
    words.why ? `Why: ${words.why}.`.replace(/\.\.$/, ".") : "",
    words.note ? `Note from ${ctx.workshop.name}: ${words.note}` : "",
    "",
    ...(kind === "cancel" ? [] : ctx.waitsOn.map((w) => `It waits for ${w}.`)),
    kind === "cancel"
      ? ""
      : ctx.showAddress
        ? `Address: ${ctx.job.siteAddress}, ${ctx.job.postcode}`
        : `Area: ${ctx.job.area} (the full address comes once you confirm)`,
    ctx.link && kind !== "cancel"
      ? awaitsAnswer
        ? `\nConfirm, say you can't make it, or propose another start: ${ctx.link}`
        : `\nCan't make it after all, or need another day? ${ctx.link}`
      : "",
    "",
    kind === "cancel"
      ? "The attached calendar update takes the visit out of your calendar."
      : awaitsAnswer
        ? "The calendar invitation is attached; accepting or declining it in your calendar app answers too."
        : "The calendar invitation is attached, so the visit is in your calendar.",
  ].filter((l, i, a) => !(l === "" && a[i - 1] === ""));
  const linkLine = (l: string) => !!ctx.link && l.includes(ctx.link);
  const text = lines.join("\n");
  const html = lines
    .map((l) =>
      linkLine(l)
        ? `<p><a href="${ctx.link}">${escapeHtml(l.trim().replace(`: ${ctx.link}`, "").replace(` ${ctx.link}`, ""))}</a></p>`
        : l
          ? `<p>${escapeHtml(l)}</p>`
          : "",
    )
    .join("");
  const ics = bookingIcs(ctx, b, method);
  await enqueueMail(m, {
    workshopId: ctx.workshop.id,
    to: ctx.trade.email,
    subject: subjects[kind](ctx, b, words),
    text,
    html,
    calendar: { method, content: ics, filename: "invite.ics" },
  });
}

/**
 * The workshop's notice of a trade's answer, however it came, with the visit's day (issue 16:
 * most workshop notices named no date): "Ashby Plaster & Coving confirmed Template coving, Mon 7
 * Dec 2026, arriving in the morning: Alcove cabinets, front room."
 */
export function answerNoticeLine(
  l: { trade: Trade; task: Task; job: Job },
  b: Booking,
  /** What the answer led to (applyAnswer): confirmed, declined or date-proposed. */
  to: BookingState,
  reason: string,
): string {
  const who = l.trade.businessName;
  const what =
    to === "confirmed"
      ? `${who} confirmed ${l.task.name}, ${whenWords(b)}`
      : to === "declined"
        ? `${who} can't make ${l.task.name} on ${dayWords(b.start)}${reason ? ` (${reason})` : ""}`
        : `${who} proposes ${dayWords(b.proposedStart!)} instead of ${dayWords(b.start)} for ${l.task.name}`;
  return `${what}: ${l.job.title}.`;
}

/** Tells the workshop's owners and fitters at once when a trade answers (the in-app view updates on its own). */
export async function notifyWorkshop(
  m: EntityManager,
  l: { workshop: Workshop; job: Job },
  line: string,
  url: string,
): Promise<void> {
  const members = await m.find(WorkshopMember, {
    where: { workshopId: l.workshop.id },
    relations: { user: true },
  });
  for (const member of members) {
    if (!member.user) continue;
    await enqueueMail(m, {
      workshopId: l.workshop.id,
      to: member.user.email,
      subject: line,
      text: `${line}\n\nOpen the job: ${url}`,
      html: `<p>${escapeHtml(line)}</p><p><a href="${url}">Open the job</a></p>`,
    });
  }
}
