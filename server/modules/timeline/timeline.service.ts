import { bookingStateTraits } from "../../../shared/bookings/lifecycle";
import { In, type DataSource, type EntityManager } from "typeorm";
import {
  AWAY_MAX_DAYS_AHEAD,
  type AwayClash,
  type AwayRange,
  type SetAwayDatesBody,
  type TimelineResponse,
} from "../../../shared/schemas";
import { newId } from "../../db/columns";
import { lockingTransaction, lockJob } from "../../db/locks";
import { HttpError, notFound } from "../../http/errors";
import { authorize, requireActor, type Actor } from "../../policies";
import { audit } from "../audit/audit.service";
import { Booking } from "../bookings/bookings.entity";
import { ACTIVE_STATES, jobResource } from "../jobs/job-access";
import { Job } from "../jobs/jobs.entity";
import { localToday } from "../jobs/jobs.presenter";
import { loadProgramme } from "../programme/programme-input";
import { Task } from "../programme/programme.entity";
import { schedule } from "../programme/programme.service";
import { noteDay, postSystemNote } from "../thread/thread-notes";
import { Trade } from "../trades/trades.entity";
import { User } from "../users/users.entity";
import { Workshop } from "../workshops/workshops.entity";
import {
  awayDaysOf,
  datesOfRanges,
  plusDays,
  presentTimeline,
  rangesOfDates,
  snapshotOf,
  type VisitRow,
} from "./timeline.presenter";
import { TimelineView } from "./timeline.entity";

async function loadJob(m: EntityManager, jobId: string): Promise<Job> {
  const job = await m.findOneBy(Job, { id: jobId });
  if (!job) throw notFound("That job");
  return job;
}

const changedSinceLoaded = () =>
  new HttpError(
    409,
    "version-conflict",
    "The visits changed since this page was loaded. Reload to see them.",
  );

/**
 * Every visit of the job, as the customer sees it: the trades' bookings that stand (sent,
 * confirmed, date proposed, needs re-confirming — a declined or cancelled one is withdrawn, a
 * draft not yet asked) and the workshop's own tasks on site at the engine's planned dates.
 */
async function visitRows(
  m: EntityManager,
  job: Job,
  workshop: Workshop,
): Promise<VisitRow[]> {
  const [bookings, tasks] = await Promise.all([
    m.find(Booking, {
      where: { jobId: job.id, state: In(ACTIVE_STATES) },
      order: { start: "ASC" },
    }),
    m.find(Task, { where: { jobId: job.id }, order: { sortOrder: "ASC" } }),
  ]);
  const tradeIds = [...new Set(bookings.map((b) => b.tradeId))];
  const trades = new Map(
    (tradeIds.length ? await m.findBy(Trade, { id: In(tradeIds) }) : []).map(
      (t) => [t.id, t],
    ),
  );
  const taskById = new Map(tasks.map((t) => [t.id, t]));
  const rows: VisitRow[] = [];
  for (const b of bookings) {
    const task = taskById.get(b.taskId);
    const trade = trades.get(b.tradeId);
    if (!task || !trade) continue;
    rows.push({
      id: b.id,
      party: trade.kind,
      businessName: trade.businessName,
      taskName: task.name,
      start: b.start,
      finish: b.finish,
      arrival: {
        window: b.arrivalWindow,
        from: b.arrivalFrom,
        to: b.arrivalTo,
      },
      prepare: task.customerNote.trim() || null,
      done: !!task.actualFinish,
      settled: bookingStateTraits[b.state].customerSees === "confirmed",
    });
  }
  const own = tasks.filter(
    (t) => t.party === "workshop" && Number(t.durationDays) > 0,
  );
  if (own.length) {
    const data = await loadProgramme(m, job, workshop);
    const result = schedule(data.input);
    const planned = new Map(result.tasks.map((r) => [r.id, r]));
    for (const t of own) {
      const r = planned.get(t.id);
      if (!r) continue;
      rows.push({
        id: t.id,
        party: "workshop",
        businessName: workshop.name,
        taskName: t.name,
        start: r.plannedStart,
        finish: r.plannedFinish,
        arrival: workshopArrival(r.plannedStart, r.plannedFinish, workshop),
        prepare: t.customerNote.trim() || null,
        done: !!t.actualFinish,
        settled: true,
      });
    }
  }
  return rows;
}

/** The workshop's own arrival, read from its planned slot: a morning, an afternoon or all day. */
function workshopArrival(
  start: string,
  finish: string,
  workshop: Workshop,
): VisitRow["arrival"] {
  const startTime = start.length > 10 ? start.slice(11, 16) : workshop.dayStart;
  const finishTime =
    finish.length > 10 ? finish.slice(11, 16) : workshop.dayEnd;
  const oneDay = start.slice(0, 10) === finish.slice(0, 10);
  // The engine's half-day slots split at midday (see shared/programme "slots").
  if (startTime >= "12:00")
    return { window: "afternoon", from: null, to: null };
  if (oneDay && finishTime <= "12:00")
    return { window: "morning", from: null, to: null };
  return { window: "all-day", from: null, to: null };
}

async function build(
  m: EntityManager,
  actor: Actor,
  job: Job,
): Promise<{ response: TimelineResponse; rows: VisitRow[] }> {
  const workshop = await m.findOneByOrFail(Workshop, { id: job.workshopId });
  const rows = await visitRows(m, job, workshop);
  const view = await m.findOneBy(TimelineView, {
    userId: actor.userId,
    jobId: job.id,
  });
  const today = localToday(job.timeZone);
  return {
    rows,
    response: presentTimeline({
      job,
      workshopName: workshop.name,
      today,
      rows,
      view,
    }),
  };
}

/** The job's timeline of visits for its customer (and the workshop, to see what the customer sees). */
export async function getTimeline(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
): Promise<TimelineResponse> {
  requireActor(actor);
  const job = await loadJob(ds.manager, jobId);
  authorize(actor, "timeline.read", await jobResource(ds.manager, job));
  return (await build(ds.manager, actor, job)).response;
}

/**
 * Marks the timeline seen: what it shows now becomes what "changed since you last looked" is
 * measured against. It carries the version the person was shown, so a change that landed between
 * their page loading and this call is not swallowed unseen (409: reload and look again).
 */
export async function markTimelineSeen(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  version: number,
): Promise<{ seenAt: string }> {
  requireActor(actor);
  // A stale version is refused from an unlocked read, before queueing for the job's lock.
  const seen = await loadJob(ds.manager, jobId);
  authorize(actor, "timeline.read", await jobResource(ds.manager, seen));
  if (seen.version !== version) throw changedSinceLoaded();
  return lockingTransaction(ds, async (m) => {
    const job = await lockJob(m, jobId);
    if (job.version !== version) throw changedSinceLoaded();
    const { rows } = await build(m, actor, job);
    const seenAt = new Date();
    const seen = snapshotOf(rows, job.handoverDate);
    const existing = await m.findOneBy(TimelineView, {
      userId: actor.userId,
      jobId: job.id,
    });
    if (existing)
      await m.update(TimelineView, { id: existing.id }, { seenAt, seen });
    else
      await m.insert(TimelineView, {
        id: newId(),
        userId: actor.userId,
        jobId: job.id,
        seenAt,
        seen: seen as never,
      });
    return { seenAt: seenAt.toISOString() };
  });
}

/** Checks the ranges against the job's today: none in the past, none more than a year ahead. */
function checkRanges(ranges: AwayRange[], today: string): void {
  const last = plusDays(today, AWAY_MAX_DAYS_AHEAD);
  const fields: Record<string, string[]> = {};
  ranges.forEach((r, i) => {
    if (r.from < today)
      (fields[`ranges.${i}.from`] ??= []).push(
        `${dayWords(r.from, today)} has passed; choose today or later`,
      );
    if (r.to > last)
      (fields[`ranges.${i}.to`] ??= []).push(
        `Choose a day up to a year ahead (until ${dayWords(last, today)})`,
      );
  });
  if (Object.keys(fields).length)
    throw new HttpError(
      400,
      "validation",
      "Away dates run from today to a year ahead.",
      fields,
    );
}

/** "Thu 14 Jan", with the year when it is not this year's ("Fri 3 Dec 2027"). */
function dayWords(date: string, today: string): string {
  return date.slice(0, 4) === today.slice(0, 4)
    ? noteDay(date)
    : `${noteDay(date)} ${date.slice(0, 4)}`;
}

/** "Mon 4 Jan – Fri 8 Jan", or one day. */
function rangeWords(r: AwayRange, today: string): string {
  return r.from === r.to
    ? dayWords(r.from, today)
    : `${dayWords(r.from, today)} – ${dayWords(r.to, today)}`;
}

/**
 * Sets the dates the customer will be away (from today on; earlier ones stay as they were). They
 * are the site's closed days, so the engine books nothing new on them; the workshop is told in
 * the thread, with any visit already booked on them (and sees those on its attention list).
 */
export async function setAwayDates(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  body: SetAwayDatesBody,
): Promise<TimelineResponse> {
  requireActor(actor);
  return lockingTransaction(ds, async (m) => {
    const job = await lockJob(m, jobId);
    authorize(actor, "awayDates.update", await jobResource(m, job));
    const today = localToday(job.timeZone);
    checkRanges(body.ranges, today);
    const kept = job.siteClosedDates.filter((d) => d < today);
    const before = new Set(job.siteClosedDates.filter((d) => d >= today));
    const coming = datesOfRanges(body.ranges);
    const next = [...new Set([...kept, ...coming])].sort();
    const added = coming.filter((d) => !before.has(d));
    const removed = [...before].filter((d) => !coming.includes(d));
    if (added.length === 0 && removed.length === 0)
      return (await build(m, actor, job)).response;

    job.siteClosedDates = next;
    // The site calendar is programme input: the version moves, so an open programme reloads.
    await m.update(
      Job,
      { id: job.id },
      { siteClosedDates: next, version: job.version + 1 },
    );
    job.version += 1;
    const who =
      (await m.findOneBy(User, { id: actor.userId }))?.name ?? "Someone";
    await audit(m, {
      workshopId: job.workshopId,
      actorUserId: actor.userId,
      action: "job.away-dates",
      entityType: "job",
      entityId: job.id,
      detail: {
        jobId: job.id,
        toVersion: job.version,
        summary: "changed the customer's away dates",
        added,
        removed,
      },
    });

    const { response, rows } = await build(m, actor, job);
    if (added.length) {
      const addedSet = new Set(added);
      const hit = rows.filter(
        (r) =>
          r.party !== "workshop" &&
          !r.done &&
          awayDaysOf(r, addedSet).length > 0,
      );
      const booked = hit.length
        ? ` Booked on those days: ${hit
            .map(
              (r) =>
                `${r.businessName} for ${r.taskName} (${awayDaysOf(r, addedSet)
                  .map((d) => dayWords(d, today))
                  .join(", ")})`,
            )
            .join("; ")}.`
        : "";
      // Workshop only: the customer is told on their own page; trades hear from the workshop.
      await postSystemNote(
        m,
        job,
        "workshop",
        `${who} will be away: ${rangesOfDates(added)
          .map((r) => rangeWords(r, today))
          .join(", ")}. The site is closed for booking then.${booked}`,
      );
    }
    return response;
  });
}

/** The workshop's bookings standing on days their customers are away, for the attention list. */
export async function listAwayClashes(
  m: EntityManager,
  workshopId: string,
): Promise<AwayClash[]> {
  const jobs = (await m.findBy(Job, { workshopId })).filter(
    (j) => j.siteClosedDates.length > 0,
  );
  if (!jobs.length) return [];
  const byId = new Map(jobs.map((j) => [j.id, j]));
  const bookings = await m.find(Booking, {
    where: { jobId: In([...byId.keys()]), state: In(ACTIVE_STATES) },
    relations: { task: true, trade: true },
    order: { start: "ASC" },
  });
  const out: AwayClash[] = [];
  for (const b of bookings) {
    const job = byId.get(b.jobId)!;
    const today = localToday(job.timeZone);
    if (b.finish.slice(0, 10) < today || b.task?.actualFinish) continue;
    const days = awayDaysOf(
      { start: b.start, finish: b.finish },
      new Set(job.siteClosedDates.filter((d) => d >= today)),
    );
    if (!days.length) continue;
    out.push({
      jobId: job.id,
      jobTitle: job.title,
      bookingId: b.id,
      taskId: b.taskId,
      taskName: b.task?.name ?? "",
      tradeName: b.trade?.businessName ?? "",
      start: b.start,
      finish: b.finish,
      awayDays: days,
    });
  }
  return out;
}

/** GET /workshops/:workshopId/away-clashes (owner and fitter). */
export async function getAwayClashes(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
): Promise<AwayClash[]> {
  authorize(actor, "bookings.manage", { kind: "workshop", workshopId });
  return listAwayClashes(ds.manager, workshopId);
}
