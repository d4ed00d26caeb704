import { stateIs } from "../../../shared/bookings/lifecycle";
import { In, Not, type DataSource, type EntityManager } from "typeorm";
import type { z } from "zod";
import {
  impactOf,
  type ProgrammeInput,
  type ProgrammeResult,
} from "../../../shared/programme";
import type {
  ExtendImpact,
  JobDrawingsResponse,
  MyVisitsResponse,
  Visit,
  VisitDetailResponse,
  extendVisitBodySchema,
  linkAnswerBodySchema,
  runningLateBodySchema,
  visitProgressBodySchema,
} from "../../../shared/schemas";
import { lockingTransaction } from "../../db/locks";
import { HttpError, notFound } from "../../http/errors";
import {
  authorize,
  requireActor,
  type Actor,
  type JobResource,
  type VisitResource,
  bookingShowsAddress,
} from "../../policies";
import { audit } from "../audit/audit.service";
import { bookingPage } from "../bookings/booking-link.service";
import { answerNoticeLine, notifyWorkshop } from "../bookings/booking-notices";
import { Booking, BookingEvent } from "../bookings/bookings.entity";
import {
  applyAnswer,
  loadBooking,
  reconfirmAfterChange,
  recordEvent,
  sendConfirmedInvitation,
  type BookingDeps,
  type Loaded,
} from "../bookings/bookings.service";
import { drawingsOfJobs } from "../drawings/drawings.service";
import { ACTIVE_STATES, jobResource, jobResources } from "../jobs/job-access";
import { Job } from "../jobs/jobs.entity";
import { localToday, zonedFormatter } from "../jobs/jobs.presenter";
import { cautionFor } from "../../../shared/schemas";
import {
  loadProgramme,
  loadProgrammes,
  type ProgrammeData,
} from "../programme/programme-input";
import { Task } from "../programme/programme.entity";
import { schedule } from "../programme/programme.service";
import { noteDay, postSystemNote } from "../thread/thread-notes";
import { Trade } from "../trades/trades.entity";
import { Workshop } from "../workshops/workshops.entity";

/** The local date and time now in a time zone: ["2026-03-05", "14:05"]. */
export function localNow(timeZone: string, now = new Date()): [string, string] {
  const time = zonedFormatter("en-GB", {
    timeZone,
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  }).format(now);
  return [localToday(timeZone, now), time];
}

const dateOf = (instant: string) => instant.slice(0, 10);

/** One job's programme as the engine computes it, shared by all of the person's visits on it. */
interface JobContext {
  job: Job;
  resource: JobResource;
  workshop: Workshop;
  data: ProgrammeData;
  result: ProgrammeResult;
  drawings: JobDrawingsResponse["drawings"];
  today: string;
}

async function jobContext(
  m: EntityManager,
  actor: Actor,
  job: Job,
): Promise<JobContext> {
  return (await jobContexts(m, actor, [job])).get(job.id)!;
}

/**
 * The contexts of many jobs in a fixed number of statements. The drawings come only where the
 * person is on the job (a trade with a standing booking there); a trade no longer on it sees none.
 */
async function jobContexts(
  m: EntityManager,
  actor: Actor,
  jobs: readonly Job[],
  known?: Map<string, JobResource>,
): Promise<Map<string, JobContext>> {
  const out = new Map<string, JobContext>();
  if (!jobs.length) return out;
  const wsIds = [...new Set(jobs.map((j) => j.workshopId))];
  const [workshops, resources] = await Promise.all([
    m.findBy(Workshop, { id: In(wsIds) }),
    known ?? jobResources(m, jobs),
  ]);
  const onJob = jobs.filter((job) =>
    [...resources.get(job.id)!.activeTradeIds].some(
      (id) => actor.trades.get(id) === job.workshopId,
    ),
  );
  const [inputs, drawings] = await Promise.all([
    loadProgrammes(m, jobs, workshops, new Date()),
    drawingsOfJobs(m, actor, onJob),
  ]);
  const workshopById = new Map(workshops.map((w) => [w.id, w]));
  for (const job of jobs) {
    const data = inputs.get(job.id)!;
    out.set(job.id, {
      job,
      resource: resources.get(job.id)!,
      workshop: workshopById.get(job.workshopId)!,
      data,
      result: schedule(data.input),
      drawings: drawings.get(job.id)?.drawings ?? [],
      today: localToday(job.timeZone),
    });
  }
  return out;
}

function visitResource(
  b: Booking,
  job: Awaited<ReturnType<typeof jobResource>>,
): VisitResource {
  return {
    kind: "visit",
    workshopId: b.workshopId,
    tradeId: b.tradeId,
    offered: b.state !== "draft",
    job,
  };
}

function presentVisit(
  ctx: JobContext,
  b: Booking,
  trade: Trade,
  late: BookingEvent | undefined,
): Visit {
  const task = ctx.data.tasks.find((t) => t.id === b.taskId);
  if (!task) throw new Error(`task ${b.taskId} missing from its job`);
  const r = ctx.result.tasks.find((t) => t.id === b.taskId);
  const byId = new Map(ctx.result.tasks.map((t) => [t.id, t]));
  const names = new Map(ctx.data.tasks.map((t) => [t.id, t.name]));
  const finished = new Set(
    ctx.data.tasks.filter((t) => t.actualFinish).map((t) => t.id),
  );
  const active = (ACTIVE_STATES as string[]).includes(b.state);
  const confirmed = b.state === "confirmed";
  const progress = task.actualFinish
    ? "done"
    : task.actualStart
      ? "started"
      : "not-started";
  const showAddress = bookingShowsAddress(b, ctx.resource);
  const lateDetail = late?.detail.runningLate as
    { day: string; arrivalTime: string } | undefined;
  return {
    bookingId: b.id,
    jobId: ctx.job.id,
    taskId: task.id,
    workshopName: ctx.workshop.name,
    tradeBusinessName: trade.businessName,
    taskName: task.name,
    jobTitle: ctx.job.title,
    jobArea: ctx.job.area,
    siteAddress: showAddress
      ? `${ctx.job.siteAddress}, ${ctx.job.postcode}`
      : null,
    state: b.state,
    start: b.start,
    finish: b.finish,
    arrivalWindow: b.arrivalWindow,
    arrivalFrom: b.arrivalFrom,
    arrivalTo: b.arrivalTo,
    proposedStart: b.proposedStart,
    progress,
    actualStart: task.actualStart,
    actualFinish: task.actualFinish,
    durationDays: Number(task.durationDays),
    readiness: {
      state: r?.readiness.state ?? "waiting",
      clearFrom: r?.readiness.state === "clear" ? r.plannedStart : null,
      waitingOn: (r?.readiness.waitingOn ?? []).map((w) => ({
        name: names.get(w.task) ?? "",
        plannedFinish: byId.get(w.task)?.plannedFinish ?? null,
        allowsFrom: w.allowsFrom,
        done: finished.has(w.task),
      })),
    },
    caution: cautionFor(task.party, task.hazards),
    drawings: active
      ? ctx.drawings.map((d) => ({
          id: d.id,
          title: d.title,
          kind: d.kind,
          currentRevision: d.currentRevision,
          forThisTask: d.tasks.some((t) => t.id === task.id),
        }))
      : [],
    runningLate:
      lateDetail && late
        ? { ...lateDetail, at: late.createdAt.toISOString() }
        : null,
    can: {
      answer:
        stateIs(b.state, "answerable") &&
        progress === "not-started" &&
        dateOf(b.finish) >= ctx.today,
      // Started on the day, or earlier once nothing holds it back.
      markStarted:
        confirmed &&
        progress === "not-started" &&
        (r?.readiness.state === "clear" || dateOf(b.start) <= ctx.today),
      markDone: confirmed && progress === "started",
      runningLate:
        confirmed && progress !== "done" && dateOf(b.finish) >= ctx.today,
      extend: confirmed && progress !== "done",
      upload: active,
    },
  };
}

/** The latest "running late" event of each booking. */
async function lateEvents(
  m: EntityManager,
  bookingIds: string[],
): Promise<Map<string, BookingEvent>> {
  if (!bookingIds.length) return new Map();
  const events = await m
    .createQueryBuilder(BookingEvent, "e")
    .where("e.bookingId IN (:...ids)", { ids: bookingIds })
    .andWhere("JSON_EXTRACT(e.detail, '$.runningLate') IS NOT NULL")
    .orderBy("e.createdAt", "DESC")
    .getMany();
  const out = new Map<string, BookingEvent>();
  for (const e of events) if (!out.has(e.bookingId)) out.set(e.bookingId, e);
  return out;
}

/**
 * GET /me/visits: the person's own bookings (sent or later) across every workshop they work
 * for. Upcoming: standing bookings not yet over or done, soonest first; past: the rest.
 */
export async function myVisits(
  ds: DataSource,
  actor: Actor | null,
): Promise<MyVisitsResponse> {
  requireActor(actor);
  const tradeIds = [...actor.trades.keys()];
  if (!tradeIds.length) return { upcoming: [], past: [] };
  const m = ds.manager;
  const bookings = await m.find(Booking, {
    where: { tradeId: In(tradeIds), state: Not("draft") },
    order: { start: "ASC" },
  });
  const trades = new Map(
    (await m.findBy(Trade, { id: In(tradeIds) })).map((t) => [t.id, t]),
  );
  const late = await lateEvents(
    m,
    bookings.map((b) => b.id),
  );
  // Every job, its policy view, workshop, programme and drawings loaded for all the visits at
  // once: a fixed number of statements however many bookings (issue 15).
  const jobIds = [...new Set(bookings.map((b) => b.jobId))];
  const jobs = jobIds.length ? await m.findBy(Job, { id: In(jobIds) }) : [];
  const resources = await jobResources(m, jobs);
  for (const b of bookings)
    // The policy decides per booking, as for any single visit.
    authorize(actor, "visit.read", visitResource(b, resources.get(b.jobId)!));
  const contexts = await jobContexts(m, actor, jobs, resources);
  const upcoming: Visit[] = [];
  const past: Visit[] = [];
  for (const b of bookings) {
    const ctx = contexts.get(b.jobId)!;
    const v = presentVisit(ctx, b, trades.get(b.tradeId)!, late.get(b.id));
    const standing = (ACTIVE_STATES as string[]).includes(b.state);
    if (standing && dateOf(b.finish) >= ctx.today && v.progress !== "done")
      upcoming.push(v);
    else past.push(v);
  }
  past.sort((a, b) => b.start.localeCompare(a.start));
  return { upcoming, past };
}

/** Loads one booking and checks the person may see it as their visit (404 otherwise) and do `action`. */
async function loadVisit(
  m: EntityManager,
  actor: Actor | null,
  bookingId: string,
  action: "visit.read" | "visit.act",
  lock = false,
): Promise<Loaded> {
  requireActor(actor);
  const l = await loadBooking(m, bookingId, lock).catch((e) => {
    if (e instanceof HttpError && e.status === 404)
      throw notFound("That visit");
    throw e;
  });
  authorize(
    actor,
    action,
    visitResource(l.booking, await jobResource(m, l.job)),
  );
  return l;
}

async function oneVisit(
  ds: DataSource,
  actor: Actor,
  bookingId: string,
): Promise<Visit> {
  const m = ds.manager;
  const l = await loadVisit(m, actor, bookingId, "visit.read");
  const ctx = await jobContext(m, actor, l.job);
  const late = await lateEvents(m, [l.booking.id]);
  return presentVisit(ctx, l.booking, l.trade, late.get(l.booking.id));
}

/** GET /visits/:bookingId: the visit and what the confirmation-link page shows for it. */
export async function getVisit(
  ds: DataSource,
  actor: Actor | null,
  bookingId: string,
): Promise<VisitDetailResponse> {
  const l = await loadVisit(ds.manager, actor, bookingId, "visit.read");
  return {
    visit: await oneVisit(ds, actor!, bookingId),
    page: await bookingPage(ds.manager, l, true),
  };
}

const jobUrl = (deps: BookingDeps, job: Job) => `${deps.appUrl}/jobs/${job.id}`;

/** Confirm, decline or propose another start, signed in: the same answer path as the link. */
export async function answerVisit(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
  body: z.output<typeof linkAnswerBodySchema>,
): Promise<VisitDetailResponse> {
  await lockingTransaction(deps.ds, async (m) => {
    const l = await loadVisit(m, actor, bookingId, "visit.act", true);
    if (l.task.actualStart)
      throw new HttpError(
        409,
        "conflict",
        "This task has started; tell the workshop in the thread if something changed.",
      );
    const from = l.booking.state;
    const to = await applyAnswer(
      m,
      deps,
      l,
      {
        answer: body.answer,
        proposedStart: body.proposedStart,
        note: body.reason,
      },
      "app",
      actor!.userId,
    );
    // applyAnswer mails the workshop for answers that come without a person signed in; this one
    // comes from the trade's own account, so the workshop is told here the same way.
    if (from !== to || to === "date-proposed") {
      await notifyWorkshop(
        m,
        l,
        answerNoticeLine(l, l.booking, to, body.reason ?? ""),
        jobUrl(deps, l.job),
      );
    }
  });
  return getVisit(deps.ds, actor, bookingId);
}

const staleVisitVersion = () =>
  new HttpError(
    409,
    "version-conflict",
    "The programme changed since you looked; check the knock-on again.",
  );

/**
 * One change to the programme made by the trade on their own task: a stale version refused from
 * an unlocked read, then the locking rule's locks (job, its trades, the booking: loadBooking), the
 * version moved and audited like the workshop's edits, the whole programme re-checked by the
 * engine, and any booking the change moves sent to its trade to confirm again.
 */
async function tradeEdit<T>(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
  summary: string,
  change: (m: EntityManager, l: Loaded, before: ProgrammeInput) => Promise<T>,
  version?: number,
): Promise<T> {
  if (version !== undefined) {
    const seen = await loadVisit(
      deps.ds.manager,
      actor,
      bookingId,
      "visit.act",
    );
    if (seen.job.version !== version) throw staleVisitVersion();
  }
  return lockingTransaction(deps.ds, async (m) => {
    const l = await loadVisit(m, actor, bookingId, "visit.act", true);
    const job = l.job; // read after the job's lock, so as it stands
    if (version !== undefined && job.version !== version)
      throw staleVisitVersion();
    const before = (await loadProgramme(m, job, l.workshop)).input;
    const value = await change(m, l, before);
    const after = (await loadProgramme(m, job, l.workshop)).input;
    schedule(after);
    const impact = impactOf(before, after);
    await reconfirmAfterChange(m, deps, job, impact, actor!.userId);
    await m.update(Job, { id: job.id }, { version: job.version + 1 });
    job.version += 1;
    await audit(m, {
      workshopId: job.workshopId,
      actorUserId: actor!.userId,
      action: "programme.changed",
      entityType: "job",
      entityId: job.id,
      detail: { jobId: job.id, toVersion: job.version, summary },
    });
    return value;
  });
}

function requireConfirmed(l: Loaded, what: string) {
  if (l.booking.state !== "confirmed")
    throw new HttpError(
      409,
      "conflict",
      `Confirm this booking first; only a confirmed visit can be ${what}.`,
    );
}

/** POST /visits/:bookingId/progress: the trade marks their own task started or done, now. */
export async function markVisitProgress(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
  body: z.output<typeof visitProgressBodySchema>,
): Promise<Visit> {
  await tradeEdit(
    deps,
    actor,
    bookingId,
    `${body.mark === "done" ? "marked their task done" : "marked their task started"}`,
    async (m, l, before) => {
      requireConfirmed(l, `marked ${body.mark}`);
      const [today, time] = localNow(l.job.timeZone);
      const task = l.task;
      // Actual dates sit on the engine's half-day slots: a bare date is that morning (a start)
      // or that day's end (a finish); "T12:00" is the afternoon's start / the morning's end.
      if (body.mark === "started") {
        if (task.actualStart)
          throw new HttpError(409, "conflict", "This task is already started.");
        const r = schedule(before).tasks.find((x) => x.id === task.id);
        if (r?.readiness.state === "waiting" && dateOf(l.booking.start) > today)
          throw new HttpError(
            409,
            "conflict",
            "It still waits for other work and its day has not come; mark it started once it is clear to start, or on the day.",
          );
        task.actualStart = time >= "12:00" ? `${today}T12:00` : today;
      } else {
        if (!task.actualStart)
          throw new HttpError(
            409,
            "conflict",
            "Mark the task started before marking it done.",
          );
        if (task.actualFinish)
          throw new HttpError(409, "conflict", "This task is already done.");
        const finish = time < "12:00" ? `${today}T12:00` : today;
        // A start marked this afternoon cannot end this morning.
        task.actualFinish =
          dateOf(task.actualStart) === today &&
          task.actualStart.endsWith("T12:00") &&
          finish.endsWith("T12:00")
            ? today
            : finish;
      }
      await m.update(
        Task,
        { id: task.id },
        { actualStart: task.actualStart, actualFinish: task.actualFinish },
      );
      // The same whole-job note the workshop's progress route leaves.
      await postSystemNote(
        m,
        l.job,
        "job",
        body.mark === "done"
          ? `Done: ${task.name} (${noteDay(task.actualFinish!)}).`
          : `Started: ${task.name} (${noteDay(task.actualStart!)}).`,
      );
    },
  );
  return oneVisit(deps.ds, actor!, bookingId);
}

/** POST /visits/:bookingId/running-late: tells the workshop (thread note and e-mail) the new arrival time. */
export async function runningLate(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
  body: z.output<typeof runningLateBodySchema>,
): Promise<Visit> {
  await lockingTransaction(deps.ds, async (m) => {
    const l = await loadVisit(m, actor, bookingId, "visit.act", true);
    requireConfirmed(l, "reported late");
    const [today] = localNow(l.job.timeZone);
    if (l.task.actualFinish || dateOf(l.booking.finish) < today)
      throw new HttpError(409, "conflict", "This visit is over.");
    // The day meant is the next day of the visit: today once started or under way, else its first day.
    const day =
      !l.task.actualStart && dateOf(l.booking.start) > today
        ? dateOf(l.booking.start)
        : today;
    const note = body.note ? ` “${body.note}”` : "";
    const line = `${l.trade.businessName} is running late for ${l.task.name}: now arriving ${body.arrivalTime} on ${noteDay(day)}.`;
    await recordEvent(
      m,
      l.booking,
      l.booking.state,
      l.booking.state,
      "app",
      actor!.userId,
      `Running late: now arriving ${body.arrivalTime} on ${noteDay(day)}.${note}`,
      { runningLate: { day, arrivalTime: body.arrivalTime } },
    );
    // "Trades & workshop": the trades after them plan around it; the customer is not in it. Their
    // own words go to the workshop only (history and e-mail): system notes carry nobody's notes.
    await postSystemNote(m, l.job, "trades", line);
    await notifyWorkshop(
      m,
      l,
      `${line.slice(0, -1)} (${l.job.title}).${note}`,
      jobUrl(deps, l.job),
    );
  });
  return oneVisit(deps.ds, actor!, bookingId);
}

/** The knock-on of one more working day on the visit's task, in names the trade may see. */
function presentExtend(
  l: Loaded,
  data: ProgrammeData,
  before: ProgrammeInput,
  after: ProgrammeInput,
  version: number,
): ExtendImpact {
  const impact = impactOf(before, after);
  const names = new Map(data.tasks.map((t) => [t.id, t.name]));
  const a = schedule(after);
  const b = schedule(before);
  const mineBefore = b.tasks.find((t) => t.id === l.task.id)!;
  const mineAfter = a.tasks.find((t) => t.id === l.task.id)!;
  return {
    version,
    taskName: l.task.name,
    fromFinish: mineBefore.plannedFinish,
    toFinish: mineAfter.plannedFinish,
    moves: impact.moves
      .filter((mv) => mv.task !== l.task.id && mv.fromStart !== mv.toStart)
      .map((mv) => ({
        taskName: names.get(mv.task) ?? "",
        fromStart: mv.fromStart,
        toStart: mv.toStart,
        byDays: mv.byDays,
      })),
    reconfirm: impact.reconfirm.map((r) => ({
      taskName: names.get(r.task) ?? "",
      proposedStart: r.proposedStart,
    })),
    problems: mineAfter.problems
      .filter((p) => p.code === "clash" || p.code === "non-working-day")
      .map((p) => p.message),
    handover: {
      date: l.job.handoverDate,
      finishBefore: impact.handover.finishBefore,
      finishAfter: impact.handover.finishAfter,
      changeDays: impact.handover.changeDays,
    },
  };
}

function longer(input: ProgrammeInput, taskId: string): ProgrammeInput {
  return {
    ...input,
    tasks: input.tasks.map((t) =>
      t.id === taskId ? { ...t, durationDays: t.durationDays + 1 } : t,
    ),
  };
}

/** POST /visits/:bookingId/extend/preview: what one more day would move, without saving. */
export async function previewExtend(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
): Promise<ExtendImpact> {
  const m = deps.ds.manager;
  const l = await loadVisit(m, actor, bookingId, "visit.act");
  requireConfirmed(l, "extended");
  if (l.task.actualFinish)
    throw new HttpError(409, "conflict", "This task is done.");
  const data = await loadProgramme(m, l.job, l.workshop);
  return presentExtend(
    l,
    data,
    data.input,
    longer(data.input, l.task.id),
    l.job.version,
  );
}

/**
 * POST /visits/:bookingId/extend: the task takes one more working day. The server recomputes the
 * knock-on at the version the trade saw; bookings it moves need re-confirming (the apply path's
 * `reconfirmAfterChange`); the trade's own booking keeps its start and ends later; the workshop is
 * told by thread note and e-mail.
 */
export async function extendVisit(
  deps: BookingDeps,
  actor: Actor | null,
  bookingId: string,
  body: z.output<typeof extendVisitBodySchema>,
): Promise<{ impact: ExtendImpact; visit: Visit }> {
  const impact = await tradeEdit(
    deps,
    actor,
    bookingId,
    "added a day to their task",
    async (m, l, before) => {
      requireConfirmed(l, "extended");
      if (l.task.actualFinish)
        throw new HttpError(409, "conflict", "This task is done.");
      const data = await loadProgramme(m, l.job, l.workshop);
      const after = longer(before, l.task.id);
      const shown = presentExtend(l, data, before, after, l.job.version);
      await m.update(
        Task,
        { id: l.task.id },
        { durationDays: String(Number(l.task.durationDays) + 1) },
      );
      const b = l.booking;
      b.finish = shown.toFinish;
      b.sequence += 1; // RFC 5546 §2.1.4: DTEND changed
      await m.save(Booking, b);
      await recordEvent(
        m,
        b,
        b.state,
        b.state,
        "app",
        actor!.userId,
        `Needs another day: now until ${noteDay(shown.toFinish)}.`,
      );
      // The updated invitation goes to them, confirmed (they asked for this): their calendar shows
      // the new end, and a later reply from it matches the raised SEQUENCE (issue 16: it bounced).
      await sendConfirmedInvitation(m, deps, l);
      const handover =
        shown.handover.changeDays > 0
          ? ` The planned finish moves ${shown.handover.changeDays} working day${shown.handover.changeDays === 1 ? "" : "s"} later.`
          : "";
      const moved =
        (shown.moves.length
          ? ` It moves ${shown.moves.map((mv) => mv.taskName).join(", ")}.`
          : "") +
        (shown.reconfirm.length
          ? ` ${shown.reconfirm.map((r) => r.taskName).join(", ")} ${shown.reconfirm.length === 1 ? "needs" : "need"} re-confirming.`
          : "");
      const line = `${l.trade.businessName} needs another day for ${l.task.name}: now until ${noteDay(shown.toFinish)}.`;
      await postSystemNote(m, l.job, "trades", `${line}${moved}${handover}`);
      await notifyWorkshop(
        m,
        l,
        `${line.slice(0, -1)} (${l.job.title}).${moved}${handover}`,
        jobUrl(deps, l.job),
      );
      return shown;
    },
    body.version,
  );
  return { impact, visit: await oneVisit(deps.ds, actor!, bookingId) };
}
