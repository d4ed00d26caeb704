import { aParty, partyNoun } from "../../../shared/words/trades";
import { stateIs } from "../../../shared/bookings/lifecycle";
import { In, type DataSource } from "typeorm";
import {
  ProgrammeInputError,
  scheduleProgramme,
  workingDaysBetween,
  type CalendarInput,
  type ProgrammeResult,
} from "../../../shared/programme";
import {
  attentionKinds,
  type AttentionItem,
  type AttentionResponse,
  openJobStatuses,
} from "../../../shared/schemas";
import { authorize, type Actor } from "../../policies";
import { notFound } from "../../http/errors";
import { Booking } from "../bookings/bookings.entity";
import { Job } from "../jobs/jobs.entity";
import { localToday } from "../jobs/jobs.presenter";
import { localNow } from "../visits/visits.service";
import { failedMailOf, shortReason } from "../outbox/outbox.service";
import { loadProgrammes } from "../programme/programme-input";
import { Trade } from "../trades/trades.entity";
import { unreadSummary } from "../thread/thread.service";
import { listAwayClashes } from "../timeline/timeline.service";
import { Workshop } from "../workshops/workshops.entity";

/** Jobs still in hand: their programmes can need the maker. */

/** An unbooked trade task this close (in the workshop's working days) needs booking even if it still waits. */
export const BOOK_AHEAD_WORKING_DAYS = 5;

/** A sent booking unanswered this long reads as a wait to chase (the bookings panel uses the same 48 h). */
export const CHASE_AFTER_HOURS = 48;

const shortDay = new Intl.DateTimeFormat("en-GB", {
  weekday: "short",
  day: "numeric",
  month: "short",
  timeZone: "UTC",
});
/** "Thu 14 Jan" for a local date or date-time (the wall-clock date, never shifted). */
export function dayText(local: string): string {
  return shortDay
    .format(new Date(`${local.slice(0, 10)}T12:00:00Z`))
    .replace(",", "");
}

/** A booking's days and arrival in words: "Thu 14 Jan, morning", "Mon 11 – Tue 12 Jan, all day". */
function visitText(
  b: Pick<
    Booking,
    "start" | "finish" | "arrivalWindow" | "arrivalFrom" | "arrivalTo"
  >,
): string {
  const first = dayText(b.start);
  const last = dayText(b.finish);
  const days = first === last ? first : `${first} – ${last}`;
  const arrival =
    b.arrivalWindow === "range"
      ? `arriving ${b.arrivalFrom}–${b.arrivalTo}`
      : b.arrivalWindow === "all-day"
        ? "all day"
        : b.arrivalWindow;
  return `${days}, ${arrival}`;
}

const plural = (n: number, one: string, many = `${one}s`) =>
  `${n} ${n === 1 ? one : many}`;

/**
 * How long ago a wait began, one rule for every item: under an hour says so; under 24 hours in
 * hours; after that in the workshop's working days (bank holidays and its days off not counted),
 * counting the days after the one it began up to today. A wait that began before a weekend and
 * has no working day since says the day instead ("on Fri 12 Dec").
 */
export function agoText(
  since: Date,
  now: Date,
  timeZone: string,
  workshopCalendar: CalendarInput,
): string {
  const hours = (now.getTime() - since.getTime()) / 3_600_000;
  if (hours < 1) return "less than an hour ago";
  if (hours < 24) return `${plural(Math.floor(hours), "hour")} ago`;
  const from = localToday(timeZone, since);
  const to = localToday(timeZone, now);
  const days = workingDaysBetween(workshopCalendar, from, to).filter(
    (d) => d > from,
  ).length;
  return days > 0
    ? `${plural(days, "working day")} ago`
    : `on ${dayText(from)}`;
}

/** Where each fix lives in the client (the target screens read these parameters). */
export const fixPaths = {
  booking: (jobId: string, bookingId: string) =>
    `/jobs/${jobId}?booking=${bookingId}#job-bookings`,
  bookAnother: (jobId: string, bookingId: string) =>
    `/jobs/${jobId}?booking=${bookingId}&open=book-another#job-bookings`,
  book: (jobId: string, taskId: string) =>
    `/jobs/${jobId}?book=${taskId}#job-bookings`,
  programmeTask: (jobId: string, taskId: string) =>
    `/jobs/${jobId}/programme?task=${taskId}`,
  thread: (jobId: string) => `/jobs/${jobId}#job-thread`,
};

/** An item plus what it is ordered by. */
interface Ranked {
  item: AttentionItem;
  /** The local date-time of the work concerned (sooner first); null sorts last. */
  due: string | null;
}

/**
 * The ordering rule, most urgent first: by kind in the order of `attentionKinds` (the programme
 * in trouble; a trade waiting for the workshop; the workshop waiting for a trade; work nobody is
 * booked for; messages), then the work that comes soonest, then the longest wait, then the job.
 */
export function compareAttention(a: Ranked, b: Ranked): number {
  const rank = (r: Ranked) => attentionKinds.indexOf(r.item.kind);
  return (
    rank(a) - rank(b) ||
    (a.due ?? "9").localeCompare(b.due ?? "9") ||
    (a.item.since ?? "9").localeCompare(b.item.since ?? "9") ||
    (a.item.job?.title ?? "").localeCompare(b.item.job?.title ?? "") ||
    a.item.id.localeCompare(b.item.id)
  );
}

/**
 * What needs the workshop now, across its open jobs: every job's programme is built and scheduled
 * exactly as the programme screen does (loadProgramme + the engine), and bookings, engine results
 * and unread thread counts are turned into one list, most urgent first (compareAttention).
 */
export async function attentionFor(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  now = new Date(),
): Promise<AttentionResponse> {
  // The attention list is a view over the workshop's jobs: owners and fitters (brief, roles).
  authorize(actor, "jobs.list", { kind: "workshop", workshopId });
  const m = ds.manager;
  const workshop = await m.findOneBy(Workshop, { id: workshopId });
  if (!workshop) throw notFound("That workshop");
  const jobs = await m.find(Job, {
    where: { workshopId, status: In(openJobStatuses) },
    order: { title: "ASC" },
  });
  const workshopCalendar: CalendarInput = {
    id: "workshop",
    workingWeekdays: workshop.workingWeekdays,
    dayStart: workshop.dayStart,
    dayEnd: workshop.dayEnd,
    holidayRegion: workshop.holidayRegion,
    daysOff: [],
  };
  const zone = jobs[0]?.timeZone ?? workshop.timeZone;
  const today = localToday(zone, now);
  const ranked: Ranked[] = [];

  // E-mail the outbox gave up on: whoever it was for never heard (a booking, an invitation).
  for (const mail of await failedMailOf(m, workshopId)) {
    const tried = mail.lastAttemptAt ?? mail.createdAt;
    const [day, time] = localNow(zone, tried);
    const waited = agoText(tried, now, zone, workshopCalendar);
    ranked.push({
      due: null,
      item: {
        id: `mail-failed:${mail.id}`,
        kind: "mail-failed",
        tone: "risk",
        job: null,
        task: null,
        trade: null,
        bookingId: null,
        sentence: `The e-mail to ${mail.to} about “${mail.subject}” could not be sent (last tried ${dayText(day)} at ${time}): ${shortReason(mail.lastError)}.`,
        since: tried.toISOString(),
        waited,
        action: { label: "Send again", retryMessageId: mail.id },
      },
    });
  }
  if (!jobs.length) {
    ranked.sort(compareAttention);
    return { today, jobsChecked: 0, items: ranked.map((r) => r.item) };
  }

  const jobIds = jobs.map((j) => j.id);
  const [allBookings, trades, unread, awayClashes] = await Promise.all([
    m.find(Booking, {
      where: { jobId: In(jobIds) },
      order: { updatedAt: "ASC" },
    }),
    m.findBy(Trade, { workshopId }),
    unreadSummary(ds, actor),
    listAwayClashes(m, workshopId),
  ]);
  const awayByBooking = new Map(awayClashes.map((a) => [a.bookingId, a]));
  const tradeById = new Map(trades.map((t) => [t.id, t]));
  // Each job's programme, as the programme screen computes it (same input builder, same engine),
  // loaded for all the jobs at once: a fixed number of statements however many jobs (issue 15).
  const inputs = await loadProgrammes(m, jobs, [workshop], now);
  const programmes = jobs.map((job) => {
    const data = inputs.get(job.id)!;
    let result: ProgrammeResult | null = null;
    try {
      result = scheduleProgramme(data.input);
    } catch (err) {
      // A programme the engine refuses is refused at save; if one slips through, its bookings still count.
      if (!(err instanceof ProgrammeInputError)) throw err;
    }
    return { job, data, result };
  });

  // From a day on, the words depend only on the day a wait began: each day is counted once per list.
  const agoMemo = new Map<string, string>();
  const ago = (d: Date, job: Job) => {
    if (now.getTime() - d.getTime() < 86_400_000)
      return agoText(d, now, job.timeZone, workshopCalendar);
    const key = `${localToday(job.timeZone, d)}|${job.timeZone}`;
    let text = agoMemo.get(key);
    if (text === undefined) {
      text = agoText(d, now, job.timeZone, workshopCalendar);
      agoMemo.set(key, text);
    }
    return text;
  };

  for (const { job, data, result } of programmes) {
    const jobRef = { id: job.id, title: job.title, area: job.area };
    const taskById = new Map(data.tasks.map((t) => [t.id, t]));
    const resultById = new Map((result?.tasks ?? []).map((r) => [r.id, r]));
    const taskRef = (taskId: string) => {
      const t = taskById.get(taskId);
      return t ? { id: t.id, name: t.name, party: t.party } : null;
    };
    const tradeRef = (tradeId: string) => {
      const t = tradeById.get(tradeId);
      return t
        ? { id: t.id, businessName: t.businessName, kind: t.kind }
        : null;
    };
    const bookings = allBookings.filter((b) => b.jobId === job.id);
    const standingTasks = new Set(
      bookings.filter((b) => stateIs(b.state, "standing")).map((b) => b.taskId),
    );
    const declinedTasks = new Set<string>();

    // Bookings: each state that waits on someone is one item.
    for (const b of bookings) {
      const task = taskById.get(b.taskId);
      const trade = tradeById.get(b.tradeId);
      if (!task || !trade || task.actualFinish) continue;
      const base = {
        job: jobRef,
        task: taskRef(b.taskId),
        trade: tradeRef(b.tradeId),
        bookingId: b.id,
      };
      if (b.state === "sent" || b.state === "needs-reconfirming") {
        // Demo and older bookings may lack sentAt; the booking's creation is then when it was asked.
        const since = b.sentAt ?? b.createdAt;
        const hours = (now.getTime() - since.getTime()) / 3_600_000;
        const reconfirm = b.state === "needs-reconfirming";
        ranked.push({
          due: b.start,
          item: {
            ...base,
            id: `${reconfirm ? "needs-reconfirming" : "awaiting-answer"}:${b.id}`,
            kind: reconfirm ? "needs-reconfirming" : "awaiting-answer",
            tone: hours >= CHASE_AFTER_HOURS ? "wait" : "info",
            sentence: reconfirm
              ? `${trade.businessName} has not re-confirmed ${task.name} since its dates moved: now ${visitText(b)}. Asked ${ago(since, job)}.`
              : `${trade.businessName} has not answered the booking for ${task.name} (${visitText(b)}). Sent ${ago(since, job)}.`,
            since: since.toISOString(),
            waited: ago(since, job),
            action: {
              label: "Chase or record the answer",
              to: fixPaths.booking(job.id, b.id),
            },
          },
        });
      } else if (b.state === "date-proposed" && b.proposedStart) {
        const since = b.answeredAt ?? b.updatedAt;
        ranked.push({
          due: b.proposedStart < b.start ? b.proposedStart : b.start,
          item: {
            ...base,
            id: `date-proposed:${b.id}`,
            kind: "date-proposed",
            tone: "wait",
            sentence: `${trade.businessName} proposes ${dayText(b.proposedStart)} instead of ${dayText(b.start)} for ${task.name}: accept or reject it. Proposed ${ago(since, job)}.`,
            since: since.toISOString(),
            waited: ago(since, job),
            action: {
              label: `Answer ${trade.businessName}`,
              to: fixPaths.booking(job.id, b.id),
            },
          },
        });
      } else if (
        b.state === "declined" &&
        !standingTasks.has(b.taskId) &&
        !declinedTasks.has(b.taskId) &&
        !task.actualStart
      ) {
        // The latest decline speaks for the task (bookings are in updatedAt order, so look ahead).
        const latest = bookings
          .filter((x) => x.taskId === b.taskId && x.state === "declined")
          .at(-1)!;
        if (latest.id !== b.id) continue;
        declinedTasks.add(b.taskId);
        const since = b.answeredAt ?? b.updatedAt;
        const r = resultById.get(b.taskId);
        ranked.push({
          due: r?.plannedStart ?? b.start,
          item: {
            ...base,
            id: `declined:${b.id}`,
            kind: "declined",
            tone: "risk",
            sentence: `${trade.businessName} declined ${task.name} (${dayText(b.start)}); nobody is booked for it. Declined ${ago(since, job)}.`,
            since: since.toISOString(),
            waited: ago(since, job),
            action: {
              label: `Book the next ${partyNoun(task.party)}`,
              to: fixPaths.bookAnother(job.id, b.id),
            },
          },
        });
      }
      // A booking on days the customer is away (the site is closed then), as the timeline module finds them.
      const away = awayByBooking.get(b.id);
      if (away)
        ranked.push({
          due: b.start,
          item: {
            ...base,
            id: `customer-away:${b.id}`,
            kind: "customer-away",
            tone: "risk",
            sentence: `${trade.businessName} is booked for ${task.name} on ${away.awayDays.map(dayText).join(", ")}, when the customer is away. Move or cancel the booking.`,
            since: null,
            waited: null,
            action: {
              label: "Open the booking",
              to: fixPaths.booking(job.id, b.id),
            },
          },
        });
    }

    if (result) {
      // Clashes: the engine's own message for each (the other booking, its day and job).
      for (const r of result.tasks) {
        const task = taskById.get(r.id);
        if (!task) continue;
        const booking = data.bookingByTask.get(r.id);
        for (const [i, p] of r.problems
          .filter((p) => p.code === "clash")
          .entries())
          ranked.push({
            due: r.plannedStart,
            item: {
              id: `clash:${r.id}:${i}`,
              kind: "clash",
              tone: "risk",
              job: jobRef,
              task: taskRef(r.id),
              trade: booking ? tradeRef(booking.tradeId) : null,
              bookingId: booking?.id ?? null,
              sentence: `Clash on ${task.name}: ${p.message}.`,
              since: null,
              waited: null,
              action: {
                label: "Move it on the programme",
                to: fixPaths.programmeTask(job.id, r.id),
              },
            },
          });
      }

      // Handover at risk: one item per job, named by the task furthest behind (the engine's float).
      const behind = result.tasks
        .filter((r) => r.problems.some((p) => p.code === "handover-at-risk"))
        .sort(
          (a, b) =>
            a.totalFloatDays - b.totalFloatDays ||
            a.plannedStart.localeCompare(b.plannedStart),
        );
      if (behind.length) {
        const worst = behind[0];
        const task = taskById.get(worst.id)!;
        const days = -worst.totalFloatDays;
        ranked.push({
          due: worst.plannedStart,
          item: {
            id: `handover-at-risk:${job.id}`,
            kind: "handover-at-risk",
            tone: "risk",
            job: jobRef,
            task: taskRef(worst.id),
            trade: null,
            bookingId: null,
            sentence: job.handoverDate
              ? `Agreed handover on ${dayText(job.handoverDate)} is at risk: ${task.name} is ${plural(days, "working day")} behind what it allows.`
              : // Without a handover date the engine measures against the programme's own finish: its words.
                `${worst.problems.find((p) => p.code === "handover-at-risk")!.message}.`,
            since: null,
            waited: null,
            action: {
              label: "See it on the programme",
              to: fixPaths.programmeTask(job.id, worst.id),
            },
          },
        });
      }

      // Trade tasks that can start (clear, or starting within BOOK_AHEAD_WORKING_DAYS) with nobody asked.
      for (const r of result.tasks) {
        const task = taskById.get(r.id);
        if (!task || task.party === "workshop") continue;
        if (task.actualStart || task.actualFinish) continue;
        if (declinedTasks.has(r.id)) continue;
        const pinned = data.bookingByTask.get(r.id);
        if (pinned) continue;
        const start = r.plannedStart.slice(0, 10);
        const soon =
          start <= today ||
          workingDaysBetween(workshopCalendar, today, start).filter(
            (d) => d > today,
          ).length <= BOOK_AHEAD_WORKING_DAYS;
        const clear = r.readiness.state === "clear";
        if (!clear && !soon) continue;
        const draft = bookings
          .filter((b) => b.taskId === r.id && b.state === "draft")
          .at(-1);
        const when = clear
          ? `${task.name} is clear to start (planned from ${dayText(start)})`
          : `${task.name} is planned to start ${dayText(start)}`;
        const draftTrade = draft ? tradeById.get(draft.tradeId) : undefined;
        ranked.push({
          due: r.plannedStart,
          item: {
            id: `not-booked:${r.id}`,
            kind: "not-booked",
            tone: clear ? "wait" : "info",
            job: jobRef,
            task: taskRef(r.id),
            trade: draft ? tradeRef(draft.tradeId) : null,
            bookingId: draft?.id ?? null,
            sentence: draft
              ? `${when}; the booking for ${draftTrade?.businessName ?? "a trade"} is a draft, not sent yet.`
              : `${when} and no ${partyNoun(task.party)} is booked.`,
            since: null,
            waited: null,
            action: draft
              ? {
                  label: "Send the draft",
                  to: fixPaths.booking(job.id, draft.id),
                }
              : {
                  label: `Book ${aParty(task.party)}`,
                  to: fixPaths.book(job.id, r.id),
                },
          },
        });
      }
    }
  }

  // Unread thread messages, from the thread module's own counts for this person.
  const open = new Map(jobs.map((j) => [j.id, j]));
  for (const u of unread.jobs) {
    const job = open.get(u.jobId);
    if (!job) continue;
    const since = new Date(u.latestAt);
    ranked.push({
      due: null,
      item: {
        id: `unread:${job.id}`,
        kind: "unread",
        tone: "info",
        job: { id: job.id, title: job.title, area: job.area },
        task: null,
        trade: null,
        bookingId: null,
        sentence: `${plural(u.unreadCount, "unread message")} in the thread; the newest ${ago(since, job)}.`,
        since: since.toISOString(),
        waited: ago(since, job),
        action: { label: "Read the thread", to: fixPaths.thread(job.id) },
      },
    });
  }

  ranked.sort(compareAttention);
  return {
    today,
    jobsChecked: jobs.length,
    items: ranked.map((r) => r.item),
  };
}
