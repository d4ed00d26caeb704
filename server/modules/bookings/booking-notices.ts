import type { BookingMailKind } from "../../../shared/bookings/lifecycle";
import type { EntityManager } from "typeorm";
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

function partstat(b: Booking): PartStat {
  if (b.state === "confirmed") return "ACCEPTED";
  if (b.state === "declined") return "DECLINED";
  if (b.state === "date-proposed") return "TENTATIVE";
  return "NEEDS-ACTION";
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

const subjects: Record<Kind, (c: NoticeContext, b: Booking) => string> = {
  invitation: (c) =>
    `${c.workshop.name}: can you do ${c.task.name} at ${c.job.area}?`,
  updated: (c) =>
    `${c.workshop.name}: new dates for ${c.task.name} at ${c.job.area} — please confirm again`,
  chase: (c) => `Reminder: please answer for ${c.task.name} at ${c.job.area}`,
  cancel: (c) =>
    `${c.workshop.name}: ${c.task.name} at ${c.job.area} is cancelled`,
  // "Tomorrow" only when the reminder goes the working day before (the workshop's setting).
  reminder: (c, b) =>
    `${c.workshop.reminderDays > 1 ? `Coming up ${dayWords(b.start)}` : "Tomorrow"}: ${c.task.name} at ${c.job.area}`,
  "proposal-rejected": (c) =>
    `${c.workshop.name}: your proposed date for ${c.task.name} doesn't work`,
};

/** Writes a booking e-mail with its calendar part to the outbox, in the caller's transaction. */
export async function queueBookingMail(
  m: EntityManager,
  ctx: NoticeContext,
  b: Booking,
  kind: Kind,
  note = "",
): Promise<void> {
  const method = kind === "cancel" ? "CANCEL" : "REQUEST";
  const lines = [
    `Hello ${ctx.trade.contactName},`,
    "",
    kind === "cancel"
      ? `${ctx.workshop.name} has cancelled ${ctx.task.name} at ${ctx.job.area} (${whenWords(b)}).`
      : kind === "reminder"
        ? `A reminder of your visit: ${ctx.task.name} at ${ctx.job.area}, ${whenWords(b)}.`
        : kind === "updated"
          ? `The dates for ${ctx.task.name} at ${ctx.job.area} have changed: now ${whenWords(b)}. Please confirm again.`
          : kind === "proposal-rejected"
            ? `${ctx.workshop.name} can't take your proposed date for ${ctx.task.name}. The booking stays ${whenWords(b)}: please confirm it, or propose another start.`
            : `${ctx.workshop.name} would like to book you for ${ctx.task.name} at ${ctx.job.area}: ${whenWords(b)}.`,
    note ? `Note from the workshop: ${note}` : "",
    "",
    ...(kind === "cancel" ? [] : ctx.waitsOn.map((w) => `It waits for ${w}.`)),
    ctx.showAddress && kind !== "cancel"
      ? `Address: ${ctx.job.siteAddress}, ${ctx.job.postcode}`
      : `Area: ${ctx.job.area} (the full address comes once you confirm)`,
    ctx.link && kind !== "cancel"
      ? `\nConfirm, say you can't make it, or propose another start: ${ctx.link}`
      : "",
    "",
    "The calendar invitation is attached; accepting or declining it in your calendar app answers too.",
  ].filter((l, i, a) => !(l === "" && a[i - 1] === ""));
  const text = lines.join("\n");
  const html = lines
    .map((l) =>
      l.includes(ctx.link ?? "\u0000")
        ? `<p><a href="${ctx.link}">Confirm, say you can't make it, or propose another start</a></p>`
        : l
          ? `<p>${escapeHtml(l)}</p>`
          : "",
    )
    .join("");
  const ics = bookingIcs(ctx, b, method);
  await enqueueMail(m, {
    workshopId: ctx.workshop.id,
    to: ctx.trade.email,
    subject: subjects[kind](ctx, b),
    text,
    html,
    calendar: { method, content: ics, filename: "invite.ics" },
  });
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
