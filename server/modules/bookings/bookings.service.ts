import { arrivalForSlot } from "../../../shared/bookings/arrival";
import {
  actionAllowed,
  bookingActions,
  stateIs,
  statesWhere,
} from "../../../shared/bookings/lifecycle";
import { randomUUID } from "node:crypto";
import { In, LessThan, type DataSource, type EntityManager } from "typeorm";
import type { z } from "zod";
import {
  firstFreeStart,
  startWindow,
  type Impact,
  type ProgrammeInput,
  type ProgrammeResult,
} from "../../../shared/programme";
import {
  arrivalProblem,
  type BookingOptionsResponse,
  type BookingResponse,
  type BookingChannel,
  type BookingState,
  type createBookingBodySchema,
  type recordAnswerBodySchema,
  type updateBookingBodySchema,
} from "../../../shared/schemas";
import { newId } from "../../db/columns";
import {
  lockingTransaction,
  lockJob,
  lockJobRow,
  lockJobTrades,
} from "../../db/locks";
import { HttpError, notFound } from "../../http/errors";
import {
  authorize,
  bookingShowsAddress,
  requireActor,
  type Actor,
} from "../../policies";
import { audit } from "../audit/audit.service";
import { Job } from "../jobs/jobs.entity";
import { jobResource } from "../jobs/job-access";
import { localToday } from "../jobs/jobs.presenter";
import {
  loadProgramme,
  PINNING_STATES,
  tradeBusy,
  type ProgrammeData,
} from "../programme/programme-input";
import { Task } from "../programme/programme.entity";
import { schedule } from "../programme/programme.service";
import { Trade } from "../trades/trades.entity";
import { User } from "../users/users.entity";
import { Workshop } from "../workshops/workshops.entity";
import { linkExpiry, linkToken, hashLinkToken } from "./booking-links";
import {
  dayWords,
  answerNoticeLine,
  notifyWorkshop,
  queueBookingMail,
  whenWords,
  type NoticeContext,
} from "./booking-notices";
import { Booking, BookingEvent } from "./bookings.entity";
import { postSystemNote } from "../thread/thread-notes";

export interface BookingDeps {
  ds: DataSource;
  appUrl: string;
  /** Signs confirmation links (see booking-links.ts). */
  linkSecret: string;
  /** Domain of the per-booking reply addresses the inbound SMTP receiver accepts. */
  replyDomain: string;
}

/** The job's programme with one trade put on one task (optionally booked at `start`), for the engine's questions. */
async function withCandidate(
  m: EntityManager,
  data: ProgrammeData,
  job: Job,
  trade: Trade,
  taskId: string,
  start: string | null,
): Promise<ProgrammeInput> {
  const sameJob = data.tasks
    .filter((t) => t.id !== taskId)
    .map((t) => data.bookingByTask.get(t.id))
    .filter((b): b is Booking => !!b && b.tradeId === trade.id);
  const name = trade.businessName;
  const calId = `trade:${trade.id}`;
  const input = data.input;
  return {
    ...input,
    calendars: [
      ...(input.calendars ?? []).filter((c) => c.id !== calId),
      {
        id: calId,
        workingWeekdays: trade.workingWeekdays,
        dayStart: trade.dayStart,
        dayEnd: trade.dayEnd,
        holidayRegion: job.holidayRegion,
        daysOff: trade.daysOff,
      },
    ],
    tasks: input.tasks.map((t) => {
      if (t.id === taskId)
        return {
          ...t,
          calendar: [calId, "site"],
          resource: name,
          bookedStart: start,
        };
      // Other tasks this trade already holds on this job keep their resource name (so clashes show).
      if (sameJob.some((b) => b.taskId === t.id))
        return { ...t, resource: name };
      return t;
    }),
    busy: [
      ...(input.busy ?? []).filter((b) => b.resource !== name),
      ...(await tradeBusy(m, trade, job.id, name)),
    ],
  };
}

function taskResult(result: ProgrammeResult, taskId: string) {
  const r = result.tasks.find((t) => t.id === taskId);
  if (!r) throw new Error(`task ${taskId} missing from the result`);
  return r;
}

interface Loaded {
  job: Job;
  workshop: Workshop;
  booking: Booking;
  task: Task;
  trade: Trade;
}

/**
 * Loads a booking with its job, task, trade and workshop. `lock` takes the locking rule's locks
 * (server/db/locks.ts) in its order — the job's row, the trades on the job and the booking's own
 * trade (and `alsoTrades`), then the booking's row — so it must run in a `lockingTransaction`.
 */
async function loadBooking(
  m: EntityManager,
  bookingId: string,
  lock = false,
  alsoTrades: string[] = [],
): Promise<Loaded> {
  if (lock) {
    const seen = await m.findOne(Booking, {
      where: { id: bookingId },
      select: { id: true, jobId: true, tradeId: true },
    });
    if (!seen) throw notFound("That booking");
    await lockJobRow(m, seen.jobId);
    // A trade the change moves the booking to is locked with the rest, in the same id order.
    await lockJobTrades(m, seen.jobId, [seen.tradeId, ...alsoTrades]);
  }
  const booking = await m.findOne(Booking, {
    where: { id: bookingId },
    ...(lock ? { lock: { mode: "pessimistic_write" as const } } : {}),
  });
  if (!booking) throw notFound("That booking");
  const [job, task, trade] = await Promise.all([
    m.findOneByOrFail(Job, { id: booking.jobId }),
    m.findOneByOrFail(Task, { id: booking.taskId }),
    m.findOneByOrFail(Trade, { id: booking.tradeId }),
  ]);
  const workshop = await m.findOneByOrFail(Workshop, { id: job.workshopId });
  return { job, workshop, booking, task, trade };
}

async function authorizeBooking(
  m: EntityManager,
  actor: Actor | null,
  l: Loaded,
) {
  requireActor(actor);
  authorize(actor, "bookings.manage", await jobResource(m, l.job));
}

/** Adds an entry to the booking's history (who, when, how, why). */
export async function recordEvent(
  m: EntityManager,
  b: Booking,
  from: BookingState | null,
  to: BookingState,
  channel: BookingChannel,
  actorUserId: string | null,
  note = "",
  detail: Record<string, unknown> = {},
): Promise<void> {
  await m.insert(BookingEvent, {
    id: newId(),
    workshopId: b.workshopId,
    bookingId: b.id,
    fromState: from,
    toState: to,
    actorUserId,
    channel,
    note,
    detail: detail as never,
  });
}

/** Issues the link for the booking's current dates (same dates → same link) and remembers its hash. */
function issueLink(deps: BookingDeps, b: Booking): string {
  const expires = linkExpiry(b.finish);
  const token = linkToken(deps.linkSecret, b.id, b.start, expires);
  b.linkTokenHash = hashLinkToken(token);
  b.linkForStart = b.start;
  b.linkExpiresAt = expires;
  return `${deps.appUrl}/b/${token}`;
}

/** The link for the booking as it stands (re-derived, not stored). */
export function currentLink(deps: BookingDeps, b: Booking): string | null {
  if (!b.linkExpiresAt || !b.linkForStart) return null;
  return `${deps.appUrl}/b/${linkToken(deps.linkSecret, b.id, b.linkForStart, b.linkExpiresAt)}`;
}

/** What the task waits on, in words, from the engine. */
async function waitsOnWords(m: EntityManager, l: Loaded): Promise<string[]> {
  const data = await loadProgramme(m, l.job, l.workshop);
  const result = schedule(data.input);
  const r = taskResult(result, l.task.id);
  const names = new Map(data.tasks.map((t) => [t.id, t.name]));
  return r.readiness.waitingOn.map(
    (w) =>
      `${names.get(w.task)} (allows a start from ${dayWords(w.allowsFrom)})`,
  );
}

async function noticeContext(
  m: EntityManager,
  deps: BookingDeps,
  l: Loaded,
  link: string | null,
): Promise<NoticeContext> {
  return {
    appUrl: deps.appUrl,
    replyDomain: deps.replyDomain,
    workshop: l.workshop,
    job: l.job,
    task: l.task,
    trade: l.trade,
    waitsOn: await waitsOnWords(m, l),
    link,
    showAddress: bookingShowsAddress(l.booking, await jobResource(m, l.job)),
  };
}

async function bumpJob(m: EntityManager, job: Job) {
  // Bookings pin tasks, so a booking change is a programme change: the job's version moves.
  await m.update(Job, { id: job.id }, { version: job.version + 1 });
  job.version += 1;
}

/** Who the workshop may book for a task: the trades of its kind, each with their first free start, and the start window. */
export async function bookingOptions(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  taskId: string,
): Promise<BookingOptionsResponse> {
  requireActor(actor);
  const job = await ds.manager.findOneBy(Job, { id: jobId });
  if (!job) throw notFound("That job");
  authorize(actor, "bookings.manage", await jobResource(ds.manager, job));
  const task = await ds.manager.findOneBy(Task, { id: taskId, jobId });
  if (!task) throw notFound("That task");
  if (task.party === "workshop")
    throw new HttpError(
      422,
      "unprocessable",
      "This task is the workshop's own; only trade tasks are booked.",
    );
  const workshop = await ds.manager.findOneByOrFail(Workshop, {
    id: job.workshopId,
  });
  const data = await loadProgramme(ds.manager, job, workshop);
  // The window comes from the task as planned without its current booking pin.
  const unpinned = {
    ...data.input,
    tasks: data.input.tasks.map((t) =>
      t.id === taskId ? { ...t, bookedStart: null } : t,
    ),
  };
  const window = startWindow(unpinned, taskId);
  const trades = await ds.manager.find(Trade, {
    where: { workshopId: job.workshopId, kind: task.party },
    order: { businessName: "ASC" },
  });
  const declined = new Set(
    (await ds.manager.findBy(Booking, { taskId, state: "declined" })).map(
      (b) => b.tradeId,
    ),
  );
  const options = [];
  for (const trade of trades) {
    const input = await withCandidate(
      ds.manager,
      data,
      job,
      trade,
      taskId,
      null,
    );
    const free = firstFreeStart(input, taskId);
    options.push({
      tradeId: trade.id,
      businessName: trade.businessName,
      kind: trade.kind,
      firstFree: free
        ? {
            start: free.start,
            finish: free.finish,
            pastLateStart: free.pastLateStart,
            message: free.message,
          }
        : null,
      declined: declined.has(trade.id),
    });
  }
  options.sort(
    (a, b) =>
      Number(a.declined) - Number(b.declined) ||
      (a.firstFree?.start ?? "9").localeCompare(b.firstFree?.start ?? "9"),
  );
  return {
    taskId,
    taskName: task.name,
    party: task.party,
    durationDays: Number(task.durationDays),
    earliestStart: window.earliestStart,
    latestStart: window.latestStart,
    keepsHandover: window.keepsHandover,
    handoverDate: job.handoverDate,
    arrivalWindows: workshop.arrivalWindows,
    trades: options,
  };
}

/** Engine check of a proposed booking: its finish, and any clash or day off with the next free start. */
async function checkBooking(
  m: EntityManager,
  job: Job,
  workshop: Workshop,
  trade: Trade,
  taskId: string,
  start: string,
) {
  const data = await loadProgramme(m, job, workshop);
  const input = await withCandidate(m, data, job, trade, taskId, start);
  const result = schedule(input);
  const r = taskResult(result, taskId);
  const problems = r.problems
    .filter((p) => p.code === "clash" || p.code === "non-working-day")
    .map((p) => p.message);
  let nextFree: string | null = null;
  if (problems.length) {
    const free = firstFreeStart(
      {
        ...input,
        tasks: input.tasks.map((t) =>
          t.id === taskId ? { ...t, bookedStart: null } : t,
        ),
      },
      taskId,
      { after: start },
    );
    nextFree = free?.start ?? null;
  }
  return {
    finish: r.plannedFinish,
    problems,
    nextFree,
    tooEarly: r.problems
      .filter((p) => p.code === "booking-too-early")
      .map((p) => p.message),
  };
}

/** The clash answer: what is in the way, and the trade's next free start (also as a field). */
function clashRefusal(
  check: { problems: string[]; nextFree: string | null },
  then = "Choose another start, or give a reason to book anyway.",
): HttpError {
  const next = check.nextFree
    ? ` Their next free start is ${dayWords(check.nextFree)}${check.nextFree.endsWith("T12:00") ? " afternoon" : ""}.`
    : "";
  return new HttpError(
    409,
    "conflict",
    `${check.problems.join(" ")}${next} ${then}`,
    {
      start: check.problems,
      ...(check.nextFree ? { nextFreeStart: [check.nextFree] } : {}),
    },
  );
}

/** A visit is over once its last day has passed in the job's time zone: no link is left to send. */
function visitOver(b: Booking, timeZone: string): boolean {
  return b.finish.slice(0, 10) < localToday(timeZone);
}

async function presentBooking(
  m: EntityManager,
  b: Booking,
): Promise<BookingResponse> {
  return (await presentBookings(m, [b]))[0];
}

/**
 * Bookings as the API shows them, with their history, in a fixed number of statements however
 * many there are (tasks, trades, jobs, events, then the people in the events): a list of bookings
 * never costs a query per booking (issue 15).
 */
async function presentBookings(
  m: EntityManager,
  bookings: readonly Booking[],
): Promise<BookingResponse[]> {
  if (!bookings.length) return [];
  const ids = (pick: (b: Booking) => string) => [
    ...new Set(bookings.map(pick)),
  ];
  const [tasks, trades, jobs, events] = await Promise.all([
    m.findBy(Task, { id: In(ids((b) => b.taskId)) }),
    m.findBy(Trade, { id: In(ids((b) => b.tradeId)) }),
    m.find(Job, {
      where: { id: In(ids((b) => b.jobId)) },
      select: { id: true, timeZone: true },
    }),
    m.find(BookingEvent, {
      where: { bookingId: In(ids((b) => b.id)) },
      order: { createdAt: "ASC" },
    }),
  ]);
  const userIds = [
    ...new Set(
      events.map((e) => e.actorUserId).filter((x): x is string => !!x),
    ),
  ];
  const users = userIds.length ? await m.findBy(User, { id: In(userIds) }) : [];
  const nameOf = new Map(users.map((u) => [u.id, u.name]));
  const taskById = new Map(tasks.map((t) => [t.id, t]));
  const tradeById = new Map(trades.map((t) => [t.id, t]));
  const zoneOf = new Map(jobs.map((j) => [j.id, j.timeZone]));
  const eventsOf = new Map<string, BookingEvent[]>();
  for (const e of events) {
    const list = eventsOf.get(e.bookingId) ?? [];
    list.push(e);
    eventsOf.set(e.bookingId, list);
  }
  return bookings.map((b) => {
    const task = taskById.get(b.taskId);
    const trade = tradeById.get(b.tradeId);
    const timeZone = zoneOf.get(b.jobId);
    // Foreign keys hold these rows; a miss is a broken database, not a request to answer.
    if (!task || !trade || !timeZone)
      throw new Error(`Booking ${b.id} lacks its task, trade or job`);
    const who = (e: BookingEvent) =>
      e.actorUserId
        ? (nameOf.get(e.actorUserId) ?? "Someone")
        : e.channel === "system"
          ? "Sitecue"
          : trade.businessName;
    return {
      id: b.id,
      jobId: b.jobId,
      taskId: b.taskId,
      taskName: task.name,
      tradeId: b.tradeId,
      tradeBusinessName: trade.businessName,
      tradeKind: trade.kind,
      state: b.state,
      start: b.start,
      finish: b.finish,
      arrivalWindow: b.arrivalWindow,
      arrivalFrom: b.arrivalFrom,
      arrivalTo: b.arrivalTo,
      proposedStart: b.proposedStart,
      shareAddress: b.shareAddress,
      overrideReason: b.overrideReason,
      sequence: b.sequence,
      sentAt: b.sentAt?.toISOString() ?? null,
      answeredAt: b.answeredAt?.toISOString() ?? null,
      visitOver: visitOver(b, timeZone),
      history: (eventsOf.get(b.id) ?? []).map((e) => ({
        at: e.createdAt.toISOString(),
        fromState: e.fromState,
        toState: e.toState,
        channel: e.channel,
        who: who(e),
        note: e.note,
      })),
    };
  });
}

/** The job's bookings with their history (workshop). */
export async function listJobBookings(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
): Promise<BookingResponse[]> {
  requireActor(actor);
  const job = await ds.manager.findOneBy(Job, { id: jobId });
  if (!job) throw notFound("That job");
  authorize(actor, "bookings.manage", await jobResource(ds.manager, job));
  const bookings = await ds.manager.find(Booking, {
    where: { jobId },
    order: { start: "ASC" },
  });
  return presentBookings(ds.manager, bookings);
}

/** Bookings waiting too long for an answer, for the maker's list (each one click from a chase). */
export async function listUnanswered(
  deps: BookingDeps,
  actor: Actor | null,
  workshopId: string,
  hours: number,
): Promise<BookingResponse[]> {
  authorize(actor, "bookings.manage", { kind: "workshop", workshopId });
  const before = new Date(Date.now() - hours * 3600_000);
  const rows = await deps.ds.manager.find(Booking, {
    where: {
      workshopId,
      state: In(statesWhere("chaseable")),
      sentAt: LessThan(before),
    },
    order: { sentAt: "ASC" },
  });
  return presentBookings(deps.ds.manager, rows);
}

/** The trade for a task of a job, or 422 naming why not (another workshop's, the wrong kind). */
async function bookableTrade(
  m: EntityManager,
  job: Job,
  task: Task,
  tradeId: string,
): Promise<Trade> {
  const trade = await m.findOneBy(Trade, {
    id: tradeId,
    workshopId: job.workshopId,
  });
  if (!trade)
    throw new HttpError(
      422,
      "unprocessable",
      "That trade is not one of this workshop's.",
      { tradeId: ["Choose one of the workshop's trades"] },
    );
  if (task.party === "workshop")
    throw new HttpError(
      422,
      "unprocessable",
      "This task is the workshop's own; only trade tasks are booked.",
      { taskId: ["Choose a trade task"] },
    );
  if (trade.kind !== task.party)
    throw new HttpError(
      422,
      "unprocessable",
      `This task is for a ${task.party}; ${trade.businessName} is a ${trade.kind}.`,
      { tradeId: ["Choose a trade of the task's kind"] },
    );
  return trade;
}

/** The workshop offers only the arrival times in its settings (issue 14): booking and changing a draft alike. */
function offeredArrival(workshop: Workshop, arrivalWindow: string): void {
  if (!workshop.arrivalWindows.includes(arrivalWindow as never))
    throw new HttpError(
      422,
      "unprocessable",
      `${workshop.name} does not offer that arrival time; choose one the workshop offers.`,
      { arrivalWindow: ["Choose an arrival time the workshop offers"] },
    );
}

/** An afternoon arrival is the afternoon slot; otherwise a bare date means the trade's morning. */
function slotStart(start: string, arrivalWindow: string, trade: Trade): string {
  if (arrivalWindow === "afternoon") return `${start.slice(0, 10)}T12:00`;
  return start.length === 10 ? `${start}T${trade.dayStart}` : start;
}

/** Books a trade for a task (a draft, or sent with its invitation); a clash or day off needs an override reason. */
export async function createBooking(
  deps: BookingDeps,
  actor: Actor | null,
  jobId: string,
  body: z.output<typeof createBookingBodySchema>,
): Promise<BookingResponse> {
  requireActor(actor);
  const { ds } = deps;
  const id = await lockingTransaction(ds, async (m) => {
    const job = await lockJob(m, jobId);
    authorize(actor, "bookings.manage", await jobResource(m, job));
    const task = await m.findOneBy(Task, { id: body.taskId, jobId });
    if (!task)
      throw new HttpError(
        422,
        "unprocessable",
        "That task is not in this job.",
        { taskId: ["Choose a task of this job"] },
      );
    const trade = await bookableTrade(m, job, task, body.tradeId);
    // Serialise bookings per trade (issue 13, item 3): two sends for one trade's half-day on two
    // jobs at once would otherwise both pass the clash check below.
    await lockJobTrades(m, jobId, [trade.id]);
    const standing = await m.findOneBy(Booking, {
      taskId: task.id,
      state: In([...PINNING_STATES, "draft"]),
    });
    if (standing)
      throw new HttpError(
        409,
        "conflict",
        "This task already has a booking; cancel it or move it instead.",
        { taskId: ["Already booked"] },
      );
    const workshop = await m.findOneByOrFail(Workshop, { id: job.workshopId });
    offeredArrival(workshop, body.arrivalWindow);
    const start = slotStart(body.start, body.arrivalWindow, trade);
    const check = await checkBooking(m, job, workshop, trade, task.id, start);
    if (check.problems.length && !body.overrideReason)
      throw clashRefusal(check);
    const b = m.create(Booking, {
      id: newId(),
      workshopId: job.workshopId,
      jobId,
      taskId: task.id,
      tradeId: trade.id,
      state: "draft",
      start,
      finish: check.finish,
      arrivalWindow: body.arrivalWindow,
      arrivalFrom: body.arrivalFrom,
      arrivalTo: body.arrivalTo,
      shareAddress: body.shareAddress,
      overrideReason: check.problems.length ? body.overrideReason : null,
      icalUid: randomUUID(),
      sequence: 0,
      proposedStart: null,
      linkTokenHash: null,
      linkExpiresAt: null,
      linkForStart: null,
      sentAt: null,
      answeredAt: null,
      reminderSentAt: null,
      chasedAt: null,
    });
    await m.insert(Booking, b);
    await recordEvent(
      m,
      b,
      null,
      "draft",
      "app",
      actor.userId,
      check.problems.length
        ? `Booked despite: ${check.problems.join(" ")} Reason: ${body.overrideReason}`
        : "",
    );
    await audit(m, {
      workshopId: job.workshopId,
      actorUserId: actor.userId,
      action: "booking.created",
      entityType: "booking",
      entityId: b.id,
      detail: {
        jobId,
        toVersion: job.version + 1,
        summary: `booked ${trade.businessName} for ${task.name}`,
      },
    });
    if (body.send)
      await sendInTransaction(
        m,
        deps,
        { job, workshop, booking: b, task, trade },
        actor.userId,
        "invitation",
      );
    await bumpJob(m, job);
    return b.id;
  });
  return presentBooking(
    ds.manager,
    await ds.manager.findOneByOrFail(Booking, { id }),
  );
}

async function sendInTransaction(
  m: EntityManager,
  deps: BookingDeps,
  l: Loaded,
  actorUserId: string | null,
  kind: "invitation" | "updated",
) {
  const from = l.booking.state;
  const to: BookingState = kind === "updated" ? "needs-reconfirming" : "sent";
  l.booking.state = to;
  const link = issueLink(deps, l.booking);
  l.booking.sentAt = new Date();
  l.booking.answeredAt = null;
  await m.save(Booking, l.booking);
  await recordEvent(
    m,
    l.booking,
    from,
    to,
    "system",
    actorUserId,
    kind === "updated"
      ? "Dates changed: sent again to confirm"
      : "Invitation sent",
    { linkHash: l.booking.linkTokenHash, forStart: l.booking.start },
  );
  await queueBookingMail(
    m,
    await noticeContext(m, deps, l, link),
    l.booking,
    kind === "updated" ? "updated" : "invitation",
  );
  // Thread notes (audiences in DEVELOPERS.md): an invitation is the workshop's business until answered.
  if (kind === "updated")
    await postSystemNote(
      m,
      l.job,
      "trades",
      `Dates changed: ${l.task.name} with ${l.trade.businessName} is now ${whenWords(l.booking)}; waiting for them to confirm again.`,
    );
  else
    await postSystemNote(
      m,
      l.job,
      "workshop",
      `Booking sent: ${l.trade.businessName} for ${l.task.name}, ${whenWords(l.booking)}.`,
    );
}

/** One change to one booking: locked, authorised, applied in a transaction, then presented. */
async function changeBooking(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
  change: (m: EntityManager, l: Loaded) => Promise<void>,
  alsoTrades: string[] = [],
): Promise<BookingResponse> {
  const { ds } = deps;
  await lockingTransaction(ds, async (m) => {
    const l = await loadBooking(m, bookingId, true, alsoTrades);
    await authorizeBooking(m, actor, l);
    await change(m, l);
  });
  return presentBooking(
    ds.manager,
    await ds.manager.findOneByOrFail(Booking, { id: bookingId }),
  );
}

/** Sends a draft booking: e-mail with the calendar invitation and the confirmation link. */
export async function sendBooking(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
): Promise<BookingResponse> {
  return changeBooking(deps, actor, bookingId, async (m, l) => {
    if (l.booking.state !== "draft")
      throw new HttpError(
        409,
        "conflict",
        `This booking is ${l.booking.state}, not a draft; use chase to send it again.`,
      );
    // A draft holds no dates, so the slot may have gone since it was made: checked again under
    // the trade's lock, unless it was booked despite a clash with a reason.
    const check = await checkBooking(
      m,
      l.job,
      l.workshop,
      l.trade,
      l.task.id,
      l.booking.start,
    );
    if (check.problems.length && !l.booking.overrideReason)
      throw clashRefusal(
        check,
        "Cancel this draft and book another start, or book it again with a reason.",
      );
    await sendInTransaction(m, deps, l, actor!.userId, "invitation");
    await bumpJob(m, l.job);
  });
}

/**
 * Changes a draft booking (nothing was sent, so nobody is told): its trade, start, arrival window,
 * address sharing or clash reason. Under the same locks as a send, checked by the engine as a new
 * booking is (a clash or day off needs a reason), with a history entry and an audit entry, and the
 * job's version moves as when the draft was made. Anything but a draft answers 409.
 */
export async function updateDraftBooking(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
  body: z.output<typeof updateBookingBodySchema>,
): Promise<BookingResponse> {
  return changeBooking(
    deps,
    actor,
    bookingId,
    async (m, l) => {
      const b = l.booking;
      if (b.state !== "draft")
        throw new HttpError(
          409,
          "conflict",
          `This booking was ${b.state === "cancelled" ? "cancelled" : "sent"}, so it is no longer a draft to change. ${b.state === "cancelled" ? "Book the task again instead." : "Cancel it and book again, or move it on the programme (the trade is asked to confirm again)."}`,
        );
      const trade =
        body.tradeId && body.tradeId !== b.tradeId
          ? await bookableTrade(m, l.job, l.task, body.tradeId)
          : l.trade;
      const arrivalWindow = body.arrivalWindow ?? b.arrivalWindow;
      const arrival = {
        arrivalWindow,
        arrivalFrom:
          arrivalWindow === "range"
            ? body.arrivalFrom !== undefined
              ? body.arrivalFrom
              : b.arrivalFrom
            : null,
        arrivalTo:
          arrivalWindow === "range"
            ? body.arrivalTo !== undefined
              ? body.arrivalTo
              : b.arrivalTo
            : null,
      };
      if (body.arrivalWindow) offeredArrival(l.workshop, arrivalWindow);
      const arrivalWrong = arrivalProblem(arrival);
      if (arrivalWrong)
        throw new HttpError(400, "validation", arrivalWrong, {
          arrivalFrom: [arrivalWrong],
        });
      // A start given as a date takes the (new) trade's morning; an unchanged one keeps its slot.
      const start = slotStart(body.start ?? b.start, arrivalWindow, trade);
      const reason =
        body.overrideReason !== undefined
          ? body.overrideReason
          : b.overrideReason;
      const check = await checkBooking(
        m,
        l.job,
        l.workshop,
        trade,
        l.task.id,
        start,
      );
      if (check.problems.length && !reason) throw clashRefusal(check);
      const before = { trade: l.trade.businessName, when: whenWords(b) };
      Object.assign(b, {
        tradeId: trade.id,
        start,
        finish: check.finish,
        ...arrival,
        shareAddress: body.shareAddress ?? b.shareAddress,
        overrideReason: check.problems.length ? reason : null,
      });
      await m.save(Booking, b);
      const changed = [
        before.trade !== trade.businessName
          ? `trade ${before.trade} → ${trade.businessName}`
          : null,
        before.when !== whenWords(b)
          ? `${before.when} → ${whenWords(b)}`
          : null,
      ].filter(Boolean);
      await recordEvent(
        m,
        b,
        "draft",
        "draft",
        "app",
        actor!.userId,
        `Draft changed${changed.length ? `: ${changed.join("; ")}` : ""}${
          check.problems.length
            ? `. Booked despite: ${check.problems.join(" ")} Reason: ${reason}`
            : ""
        }`,
      );
      await audit(m, {
        workshopId: b.workshopId,
        actorUserId: actor!.userId,
        action: "booking.updated",
        entityType: "booking",
        entityId: b.id,
        detail: {
          jobId: b.jobId,
          toVersion: l.job.version + 1,
          summary: `changed the draft booking of ${trade.businessName} for ${l.task.name}`,
        },
      });
      await bumpJob(m, l.job);
    },
    body.tradeId ? [body.tradeId] : [],
  );
}

/**
 * Applies a trade's answer, however it came (link, phone, text, calendar app): one path, so each
 * counts the same. Returns the new state.
 */
export async function applyAnswer(
  m: EntityManager,
  deps: BookingDeps,
  l: Loaded,
  answer: {
    answer: "confirm" | "decline" | "propose";
    proposedStart: string | null;
    note: string;
  },
  channel: BookingChannel,
  actorUserId: string | null,
): Promise<BookingState> {
  const b = l.booking;
  if (!stateIs(b.state, "answerable"))
    throw new HttpError(
      409,
      "conflict",
      `This booking is ${b.state}; it cannot be answered now.`,
    );
  const from = b.state;
  let to: BookingState;
  if (answer.answer === "confirm") {
    to = "confirmed";
    b.proposedStart = null;
  } else if (answer.answer === "decline") {
    to = "declined";
  } else {
    to = "date-proposed";
    b.proposedStart =
      answer.proposedStart!.length === 10
        ? `${answer.proposedStart}T${l.trade.dayStart}`
        : answer.proposedStart;
  }
  if (from === to && to !== "date-proposed") return to; // a repeated answer changes nothing
  b.state = to;
  b.answeredAt = new Date();
  await m.save(Booking, b);
  await recordEvent(
    m,
    b,
    from,
    to,
    channel,
    actorUserId,
    answer.note,
    answer.proposedStart ? { proposedStart: b.proposedStart } : {},
  );
  await audit(m, {
    workshopId: b.workshopId,
    actorUserId,
    action: `booking.${to}`,
    entityType: "booking",
    entityId: b.id,
    detail: {
      jobId: b.jobId,
      channel,
      toVersion: l.job.version + 1,
      summary: `recorded ${l.trade.businessName}: ${to}`,
    },
  });
  await bumpJob(m, l.job);
  // Confirmations are news for the other trades too; declines and proposals stay with the workshop.
  if (to === "confirmed") {
    await postSystemNote(
      m,
      l.job,
      "trades",
      `${l.trade.businessName} confirmed ${l.task.name}: ${whenWords(b)}.`,
    );
    // The lifecycle table's confirm action sends the confirmed invitation: the same UID and
    // SEQUENCE (no date changed, RFC 5546 §2.1.4) with the full address now in LOCATION, so the
    // trade's calendar shows where to go before the reminder (issue 16).
    await sendConfirmedInvitation(m, deps, l);
  } else if (to === "declined")
    await postSystemNote(
      m,
      l.job,
      "workshop",
      `${l.trade.businessName} declined ${l.task.name} (${whenWords(b)}).`,
    );
  else
    await postSystemNote(
      m,
      l.job,
      "workshop",
      `${l.trade.businessName} proposes ${dayWords(b.proposedStart!)} for ${l.task.name} instead of ${dayWords(b.start)}.`,
    );
  if (channel === "link" || channel === "calendar-reply") {
    await notifyWorkshop(
      m,
      l,
      answerNoticeLine(l, b, to, answer.note),
      `${deps.appUrl}/jobs/${l.job.id}`,
    );
  }
  return to;
}

/**
 * The invitation as it now stands, to a trade whose booking is confirmed (after they confirm, or
 * after "Need another day" moved its end): their calendar gets the current dates and the full
 * address, and a later reply from it matches the current SEQUENCE. It asks nothing of them.
 */
export async function sendConfirmedInvitation(
  m: EntityManager,
  deps: BookingDeps,
  l: Loaded,
): Promise<void> {
  await queueBookingMail(
    m,
    await noticeContext(m, deps, l, await ensureLink(m, deps, l.booking)),
    l.booking,
    bookingActions.confirm.mail,
  );
}

/** The maker records an answer given by phone or text, on the trade's behalf. */
export async function recordAnswer(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
  body: z.output<typeof recordAnswerBodySchema>,
): Promise<BookingResponse> {
  return changeBooking(deps, actor, bookingId, async (m, l) => {
    const note = body.note || `Answered by ${body.channel}`;
    await applyAnswer(
      m,
      deps,
      l,
      { answer: body.answer, proposedStart: body.proposedStart, note },
      body.channel,
      actor!.userId,
    );
  });
}

/** Accepts a trade's proposed start (the booking moves there, confirmed, with an updated invitation) or rejects it. */
export async function decideProposal(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
  accept: boolean,
  note: string,
): Promise<BookingResponse> {
  return changeBooking(deps, actor, bookingId, async (m, l) => {
    const b = l.booking;
    if (b.state !== "date-proposed" || !b.proposedStart)
      throw new HttpError(
        409,
        "conflict",
        "There is no proposed date to decide on.",
      );
    if (accept) {
      const check = await checkBooking(
        m,
        l.job,
        l.workshop,
        l.trade,
        l.task.id,
        b.proposedStart,
      );
      if (check.problems.length)
        throw clashRefusal(
          check,
          "Reject this proposal to ask them for the booked start again.",
        );
      b.start = b.proposedStart;
      b.finish = check.finish;
      Object.assign(b, arrivalForSlot(b.start, b));
      b.proposedStart = null;
      b.sequence += 1; // RFC 5546 §2.1.4: the dates changed
      b.state = "confirmed";
      const link = issueLink(deps, b);
      await m.save(Booking, b);
      await recordEvent(
        m,
        b,
        "date-proposed",
        "confirmed",
        "app",
        actor!.userId,
        note || "Proposed start accepted",
        { linkHash: b.linkTokenHash, forStart: b.start },
      );
      await queueBookingMail(
        m,
        await noticeContext(m, deps, l, link),
        b,
        "updated",
        { note },
      );
      await postSystemNote(
        m,
        l.job,
        "trades",
        `${l.trade.businessName} confirmed ${l.task.name} on their proposed date: ${whenWords(b)}.`,
      );
    } else {
      b.proposedStart = null;
      b.state = "sent";
      await m.save(Booking, b);
      await recordEvent(
        m,
        b,
        "date-proposed",
        "sent",
        "app",
        actor!.userId,
        note || "Proposed start rejected",
      );
      await queueBookingMail(
        m,
        await noticeContext(m, deps, l, await ensureLink(m, deps, b)),
        b,
        "proposal-rejected",
        { note },
      );
      await postSystemNote(
        m,
        l.job,
        "workshop",
        `${l.trade.businessName}'s proposed date for ${l.task.name} was not accepted; asked again for ${whenWords(b)}.`,
      );
    }
    await audit(m, {
      workshopId: b.workshopId,
      actorUserId: actor!.userId,
      action: accept
        ? "booking.proposal-accepted"
        : "booking.proposal-rejected",
      entityType: "booking",
      entityId: b.id,
      detail: {
        jobId: b.jobId,
        toVersion: l.job.version + 1,
        summary: `${accept ? "accepted" : "rejected"} ${l.trade.businessName}'s proposed date`,
      },
    });
    await bumpJob(m, l.job);
  });
}

/** Cancels a booking: METHOD:CANCEL with a higher SEQUENCE goes to the trade. */
export async function cancelBooking(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
  reason: string,
): Promise<BookingResponse> {
  return changeBooking(deps, actor, bookingId, async (m, l) => {
    const b = l.booking;
    if (b.state === "cancelled") return;
    const from = b.state;
    const wasSent = from !== "draft";
    b.state = "cancelled";
    if (wasSent) b.sequence += 1; // RFC 5546 §2.1.4: CANCEL bumps the sequence
    b.linkTokenHash = null;
    await m.save(Booking, b);
    await recordEvent(m, b, from, "cancelled", "app", actor!.userId, reason);
    // The reason is the workshop's own words, so the note leaves it out; a draft nobody saw stays in the workshop.
    await postSystemNote(
      m,
      l.job,
      wasSent ? "trades" : "workshop",
      `Booking cancelled: ${l.trade.businessName} for ${l.task.name}.`,
    );
    if (wasSent && from !== "declined")
      await queueBookingMail(
        m,
        await noticeContext(m, deps, l, null),
        b,
        "cancel",
        { note: reason },
      );
    await audit(m, {
      workshopId: b.workshopId,
      actorUserId: actor!.userId,
      action: "booking.cancelled",
      entityType: "booking",
      entityId: b.id,
      detail: {
        jobId: b.jobId,
        toVersion: l.job.version + 1,
        summary: `cancelled ${l.trade.businessName} for ${l.task.name}`,
      },
    });
    await bumpJob(m, l.job);
  });
}

/** Sends the invitation again (same UID and SEQUENCE) to a trade who has not answered. */
export async function chaseBooking(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
): Promise<BookingResponse> {
  return changeBooking(deps, actor, bookingId, async (m, l) => {
    const b = l.booking;
    if (!actionAllowed("chase", b.state))
      throw new HttpError(
        409,
        "conflict",
        `This booking is ${b.state}; only an unanswered booking is chased.`,
      );
    b.chasedAt = new Date();
    await m.save(Booking, b);
    await recordEvent(
      m,
      b,
      b.state,
      b.state,
      "app",
      actor!.userId,
      "Chased: invitation sent again",
    );
    await queueBookingMail(
      m,
      await noticeContext(m, deps, l, await ensureLink(m, deps, b)),
      b,
      "chase",
    );
  });
}

/** The confirmation link for the booking's current dates, to paste into a text message. */
export async function copyLink(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
): Promise<{ url: string }> {
  const l = await loadBooking(deps.ds.manager, bookingId);
  await authorizeBooking(deps.ds.manager, actor, l);
  if (l.booking.state === "draft")
    throw new HttpError(
      409,
      "conflict",
      "Send the booking first; a draft has no link yet.",
    );
  if (l.booking.state === "cancelled")
    throw new HttpError(
      409,
      "conflict",
      "This booking is cancelled; its link no longer works.",
    );
  // The visit's days are over: a link would only open "expired" (its expiry is a week after the
  // last day), and there is nothing left to confirm. 410: that link is gone for good (RFC 9110 §15.5.11).
  if (visitOver(l.booking, l.job.timeZone))
    throw new HttpError(
      410,
      "gone",
      `This visit is over: it ended on ${dayWords(l.booking.finish)}, so there is nothing to confirm and no link to send.`,
    );
  const url = await deps.ds.transaction((m) => ensureLink(m, deps, l.booking));
  return { url };
}

/**
 * The link for a sent booking, issuing one if it has none yet (bookings sent before links
 * existed, such as the demo's); recorded in the history like any issued link.
 */
export async function ensureLink(
  m: EntityManager,
  deps: BookingDeps,
  b: Booking,
): Promise<string> {
  const existing = b.linkTokenHash ? currentLink(deps, b) : null;
  if (existing) return existing;
  const url = issueLink(deps, b);
  await m.update(
    Booking,
    { id: b.id },
    {
      linkTokenHash: b.linkTokenHash,
      linkForStart: b.linkForStart,
      linkExpiresAt: b.linkExpiresAt,
    },
  );
  await recordEvent(
    m,
    b,
    b.state,
    b.state,
    "system",
    null,
    "Confirmation link issued",
    { linkHash: b.linkTokenHash, forStart: b.start },
  );
  return url;
}

/**
 * After a programme change (scenario 4): every booking the engine says must move goes to its
 * proposed start, needs re-confirming, gets an updated invitation (same UID, higher SEQUENCE)
 * with a fresh link; bookings whose dates still work stay.
 */
export async function reconfirmAfterChange(
  m: EntityManager,
  deps: BookingDeps,
  job: Job,
  impact: Impact,
  actorUserId: string,
): Promise<string[]> {
  const moved: string[] = [];
  for (const r of impact.reconfirm) {
    // Found unlocked: loadBooking below takes the locks in the rule's order.
    const booking = await m.findOne(Booking, {
      where: { taskId: r.task, state: In([...PINNING_STATES]) },
    });
    if (!booking || booking.start === r.proposedStart) continue;
    const l = await loadBooking(m, booking.id, true);
    const check = await checkBooking(
      m,
      job,
      l.workshop,
      l.trade,
      l.task.id,
      r.proposedStart,
    );
    const from = l.booking.state;
    l.booking.start = r.proposedStart;
    l.booking.finish = check.finish;
    Object.assign(l.booking, arrivalForSlot(l.booking.start, l.booking));
    l.booking.sequence += 1; // RFC 5546 §2.1.4: DTSTART changed
    l.booking.state = "needs-reconfirming";
    const link = issueLink(deps, l.booking);
    l.booking.answeredAt = null;
    await m.save(Booking, l.booking);
    await recordEvent(
      m,
      l.booking,
      from,
      "needs-reconfirming",
      "system",
      actorUserId,
      r.reason,
      { linkHash: l.booking.linkTokenHash, forStart: l.booking.start },
    );
    await queueBookingMail(
      m,
      await noticeContext(m, deps, l, link),
      l.booking,
      "updated",
      { why: r.reason },
    );
    await postSystemNote(
      m,
      l.job,
      "trades",
      `Rescheduled: ${l.task.name} with ${l.trade.businessName} moves to ${whenWords(l.booking)}; it needs re-confirming.`,
    );
    moved.push(l.booking.id);
  }
  return moved;
}

export { loadBooking, type Loaded };
