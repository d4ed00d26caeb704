import { stateIs } from "../../../shared/bookings/lifecycle";
import { bookingShowsAddress } from "../../policies";
import { jobResource } from "../jobs/job-access";
import type { DataSource, EntityManager } from "typeorm";
import type { z } from "zod";
import { firstFreeStart, startWindow } from "../../../shared/programme";
import type {
  LinkPageResponse,
  linkAnswerBodySchema,
} from "../../../shared/schemas";
import { HttpError } from "../../http/errors";
import { lockingTransaction } from "../../db/locks";
import { loadProgramme } from "../programme/programme-input";
import { cautionFor } from "../../../shared/schemas";
import { schedule } from "../programme/programme.service";
import { localToday } from "../jobs/jobs.presenter";
import { hashLinkToken } from "./booking-links";
import { dayWords } from "./booking-notices";
import { Booking, BookingEvent } from "./bookings.entity";
import {
  applyAnswer,
  loadBooking,
  type BookingDeps,
  type Loaded,
} from "./bookings.service";

const invalid = () =>
  new HttpError(
    404,
    "token-invalid",
    "This booking link is not valid or has expired. Ask the workshop for a new one.",
  );

/** Finds the booking a link belongs to; also finds links issued for earlier dates (they can show, not confirm). */
async function resolve(
  m: EntityManager,
  token: string,
): Promise<{ l: Loaded; current: boolean }> {
  const hash = hashLinkToken(token);
  let booking = await m.findOneBy(Booking, { linkTokenHash: hash });
  let current = true;
  if (!booking) {
    const event = await m
      .createQueryBuilder(BookingEvent, "e")
      .where("JSON_UNQUOTE(JSON_EXTRACT(e.detail, '$.linkHash')) = :h", {
        h: hash,
      })
      .getOne();
    if (!event) throw invalid();
    booking = await m.findOneBy(Booking, { id: event.bookingId });
    if (!booking) throw invalid();
    current = false;
  }
  if (
    current &&
    booking.linkExpiresAt &&
    booking.linkExpiresAt.getTime() < Date.now()
  )
    throw invalid();
  return { l: await loadBooking(m, booking.id), current };
}

/** The day (local to the job, YYYY-MM-DD) the booking was cancelled, from its history; null if unknown. */
async function cancelledOn(
  m: EntityManager,
  l: Loaded,
): Promise<string | null> {
  if (l.booking.state !== "cancelled") return null;
  const event = await m.findOne(BookingEvent, {
    where: { bookingId: l.booking.id, toState: "cancelled" },
    order: { createdAt: "DESC" },
  });
  return event ? localToday(l.job.timeZone, event.createdAt) : null;
}

/**
 * The answer to a trade who tries to answer a cancelled booking by link: it was the workshop that
 * cancelled it, and there is nothing to confirm (issue 13: it used to say the dates had changed).
 */
function cancelledError(l: Loaded, on: string | null): HttpError {
  return new HttpError(
    409,
    "conflict",
    `${l.workshop.name} cancelled this booking${on ? ` on ${dayWords(on)}` : ""}, so there is nothing to confirm.`,
  );
}

/** Everything the trade's confirmation page shows, scoped to that one booking. */
export async function linkPage(
  ds: DataSource,
  token: string,
): Promise<LinkPageResponse> {
  const { l, current } = await resolve(ds.manager, token);
  return bookingPage(ds.manager, l, current);
}

/**
 * The confirmation page's content for one loaded booking: by link (`current` false for a link
 * issued for earlier dates), or for the signed-in trade's visit page (always current).
 */
export async function bookingPage(
  m: EntityManager,
  l: Loaded,
  current: boolean,
): Promise<LinkPageResponse> {
  const b = l.booking;
  const data = await loadProgramme(m, l.job, l.workshop);
  const result = schedule(data.input);
  const r = result.tasks.find((t) => t.id === l.task.id)!;
  const names = new Map(data.tasks.map((t) => [t.id, t]));
  const waitsOn = data.links
    .filter((k) => k.toTaskId === l.task.id)
    .map((k) => {
      const pred = names.get(k.fromTaskId)!;
      const pr = result.tasks.find((t) => t.id === pred.id);
      const waiting = r.readiness.waitingOn.find((w) => w.task === pred.id);
      return {
        name: pred.name,
        state: pred.actualFinish
          ? "done"
          : pred.actualStart
            ? "started"
            : "planned",
        plannedFinish: pr?.plannedFinish ?? null,
        allowsFrom: waiting?.allowsFrom ?? null,
      };
    });
  const unpinned = {
    ...data.input,
    tasks: data.input.tasks.map((t) =>
      t.id === l.task.id ? { ...t, bookedStart: null } : t,
    ),
  };
  const window = startWindow(unpinned, l.task.id);
  const windowDates = [...new Set(window.starts.map((s) => s.slice(0, 10)))];
  // The trade's own free days: first free starts found one after another over the next weeks.
  const freeDates: string[] = [];
  const resource = data.input.tasks.find((t) => t.id === l.task.id)?.resource;
  if (resource) {
    let after = window.earliestStart;
    for (let i = 0; i < 15; i++) {
      const free = firstFreeStart(unpinned, l.task.id, { resource, after });
      if (!free) break;
      const day = free.start.slice(0, 10);
      if (!freeDates.includes(day)) freeDates.push(day);
      const next = new Date(`${day}T12:00:00Z`);
      next.setUTCDate(next.getUTCDate() + 1);
      after = next.toISOString().slice(0, 10);
    }
  }
  const showAddress =
    current && bookingShowsAddress(b, await jobResource(m, l.job));
  const cancelled = b.state === "cancelled";
  return {
    status: cancelled ? "cancelled" : current ? "current" : "dates-changed",
    cancelledOn: await cancelledOn(m, l),
    workshopName: l.workshop.name,
    tradeBusinessName: l.trade.businessName,
    taskName: l.task.name,
    jobArea: l.job.area,
    siteAddress: showAddress ? `${l.job.siteAddress}, ${l.job.postcode}` : null,
    accessNotes: showAddress ? l.job.accessNotes : null,
    state: b.state,
    start: b.start,
    finish: b.finish,
    arrivalWindow: b.arrivalWindow,
    arrivalFrom: b.arrivalFrom,
    arrivalTo: b.arrivalTo,
    proposedStart: b.proposedStart,
    caution: cautionFor(l.task.party, l.task.hazards),
    customerNote: l.task.customerNote,
    waitsOn,
    windowDates,
    freeDates,
    handoverKept: window.keepsHandover,
    handoverDate: l.job.handoverDate,
    answeredAt: b.answeredAt?.toISOString() ?? null,
    canAnswer: current && stateIs(b.state, "answerable"),
  };
}

/** The trade answers by link: exactly what a recorded answer or a calendar-app reply does. */
export async function answerByLink(
  deps: BookingDeps,
  token: string,
  body: z.output<typeof linkAnswerBodySchema>,
): Promise<LinkPageResponse> {
  await lockingTransaction(deps.ds, async (m) => {
    const { l, current } = await resolve(m, token);
    // Cancelled first: a cancelled booking's link is never current, and "the dates changed" is untrue.
    if (l.booking.state === "cancelled")
      throw cancelledError(l, await cancelledOn(m, l));
    if (!current)
      throw new HttpError(
        409,
        "conflict",
        "The dates of this booking have changed since this link was sent; the new dates are shown. Use the newest e-mail's link to answer.",
      );
    const locked = await loadBooking(m, l.booking.id, true);
    await applyAnswer(
      m,
      deps,
      locked,
      {
        answer: body.answer,
        proposedStart: body.proposedStart,
        note: body.reason,
      },
      "link",
      null,
    );
  });
  return linkPage(deps.ds, token);
}
