// The calendars' one date-range request (issue 15). Every branch loads what it needs with a fixed
// number of statements — one per table with `IN (…)`, the programmes through `loadProgrammes` —
// then runs the engine per job in memory, so a workshop of 50 jobs costs what one of 5 does.
import { In, type DataSource, type EntityManager } from "typeorm";
import {
  openJobStatuses,
  type CalendarQuery,
  type CalendarResponse,
} from "../../../shared/schemas";
import { notFound } from "../../http/errors";
import { authorize, requireActor, type Actor } from "../../policies";
import { Booking } from "../bookings/bookings.entity";
import { ACTIVE_STATES, jobResource } from "../jobs/job-access";
import { Job } from "../jobs/jobs.entity";
import { loadProgrammes } from "../programme/programme-input";
import { schedule } from "../programme/programme.service";
import { Task } from "../programme/programme.entity";
import { Trade } from "../trades/trades.entity";
import { Workshop } from "../workshops/workshops.entity";
import {
  planCalendar,
  tradeCalendar,
  type PlannedJob,
  type Range,
} from "./calendar.presenter";

/** GET /calendar: the workshop's, one job's or the person's own calendar for a range. */
export async function getCalendar(
  ds: DataSource,
  actor: Actor | null,
  q: CalendarQuery,
): Promise<CalendarResponse> {
  requireActor(actor);
  const range = { from: q.from, to: q.to };
  const m = ds.manager;
  const body =
    q.scope === "me"
      ? await ownCalendar(m, actor, range)
      : q.scope === "workshop"
        ? await workshopCalendar(m, actor, q.id!, range)
        : await jobCalendar(m, actor, q.id!, range);
  return { scope: q.scope, ...range, ...body };
}

type Body = Omit<CalendarResponse, "scope" | "from" | "to">;

/** The workshop's live jobs (neither handed over nor cancelled), for its owners and fitters. */
async function workshopCalendar(
  m: EntityManager,
  actor: Actor,
  workshopId: string,
  range: Range,
): Promise<Body> {
  // Decided on the membership alone: another workshop's owner learns nothing (404).
  authorize(actor, "calendar.read", { kind: "workshop", workshopId });
  const [workshop, jobs] = await Promise.all([
    m.findOneBy(Workshop, { id: workshopId }),
    m.find(Job, {
      where: { workshopId, status: In(openJobStatuses) },
      order: { createdAt: "ASC" },
    }),
  ]);
  if (!workshop) throw notFound("That workshop");
  return planned(m, jobs, workshop, range);
}

/** One job's calendar, as on its page: the workshop's members (a trade on it has their own). */
async function jobCalendar(
  m: EntityManager,
  actor: Actor,
  jobId: string,
  range: Range,
): Promise<Body> {
  const job = await m.findOneBy(Job, { id: jobId });
  if (!job) throw notFound("That job");
  authorize(actor, "calendar.read", await jobResource(m, job));
  const workshop = await m.findOneByOrFail(Workshop, { id: job.workshopId });
  return planned(m, [job], workshop, range);
}

/** Planned dates of every task of `jobs` (one workshop's) by the engine, as `GET /programme` has them. */
async function planned(
  m: EntityManager,
  jobs: Job[],
  workshop: Workshop,
  range: Range,
): Promise<Body> {
  // Drafts do not hold the trade's dates (the engine leaves them out), but the workshop's own
  // calendar names them: one more statement, the trade joined.
  const [data, drafts] = await Promise.all([
    loadProgrammes(m, jobs, [workshop]),
    jobs.length
      ? m.find(Booking, {
          where: { jobId: In(jobs.map((j) => j.id)), state: "draft" },
          relations: { trade: true },
          order: { updatedAt: "ASC" },
        })
      : [],
  ]);
  const draftByTask = new Map(drafts.map((b) => [b.taskId, b]));
  const plannedJobs: PlannedJob[] = [];
  const trades = new Map<string, string>();
  for (const b of drafts)
    if (b.trade) trades.set(b.tradeId, b.trade.businessName);
  for (const job of jobs) {
    const d = data.get(job.id)!;
    const result = schedule(d.input);
    const tradeNames = new Map(
      [...d.trades.values()].map((t) => [t.id, t.businessName]),
    );
    for (const [id, name] of tradeNames) trades.set(id, name);
    plannedJobs.push({
      id: job.id,
      title: job.title,
      tasks: d.tasks.map((t) => {
        const b = d.bookingByTask.get(t.id);
        const draft = b ? undefined : draftByTask.get(t.id);
        return {
          id: t.id,
          name: t.name,
          party: t.party,
          actualStart: t.actualStart,
          actualFinish: t.actualFinish,
          booking: b
            ? {
                state: b.state,
                tradeId: b.tradeId,
                tradeName: tradeNames.get(b.tradeId) ?? "",
              }
            : draft
              ? {
                  state: draft.state,
                  tradeId: draft.tradeId,
                  tradeName: draft.trade?.businessName ?? "",
                }
              : null,
        };
      }),
      planned: result.tasks,
      calendars: d.input.calendars ?? [],
      tradeNames,
    });
  }
  return {
    ...planCalendar(plannedJobs, range, [workshop.holidayRegion]),
    jobs: jobs.map((j) => ({
      id: j.id,
      title: j.title,
      workshopId: workshop.id,
      workshopName: workshop.name,
      taskCount: data.get(j.id)!.tasks.length,
    })),
    trades: [...trades]
      .map(([id, name]) => ({ id, name }))
      .sort((a, b) => a.name.localeCompare(b.name)),
  };
}

/**
 * A trade's own calendar: their offered bookings from every workshop they work for, their days
 * off (one set, kept on each of their trade records) and the bank holidays where they work.
 */
async function ownCalendar(
  m: EntityManager,
  actor: Actor,
  range: Range,
): Promise<Body> {
  authorize(actor, "calendar.readOwn", {
    kind: "person",
    userId: actor.userId,
  });
  const tradeIds = [...actor.trades.keys()];
  const [bookings, trades] = await Promise.all([
    m.find(Booking, {
      where: { tradeId: In(tradeIds), state: In(ACTIVE_STATES) },
      order: { start: "ASC" },
    }),
    m.findBy(Trade, { id: In(tradeIds) }),
  ]);
  const jobIds = [...new Set(bookings.map((b) => b.jobId))];
  const workshopIds = [
    ...new Set([
      ...actor.trades.values(),
      ...bookings.map((b) => b.workshopId),
    ]),
  ];
  const [jobs, tasks, workshops] = await Promise.all([
    jobIds.length ? m.findBy(Job, { id: In(jobIds) }) : [],
    bookings.length
      ? m.find(Task, {
          where: { id: In([...new Set(bookings.map((b) => b.taskId))]) },
          select: { id: true, name: true },
        })
      : [],
    m.findBy(Workshop, { id: In(workshopIds) }),
  ]);
  const jobById = new Map(jobs.map((j) => [j.id, j]));
  const taskName = new Map(tasks.map((t) => [t.id, t.name]));
  const workshopName = new Map(workshops.map((w) => [w.id, w.name]));
  const tradeById = new Map(trades.map((t) => [t.id, t]));
  const visits = bookings.flatMap((b) => {
    const job = jobById.get(b.jobId);
    const trade = tradeById.get(b.tradeId);
    if (!job || !trade) return [];
    return [
      {
        bookingId: b.id,
        jobId: job.id,
        jobTitle: job.title,
        jobArea: job.area,
        workshopName: workshopName.get(job.workshopId) ?? "",
        taskId: b.taskId,
        taskName: taskName.get(b.taskId) ?? null,
        tradeKind: trade.kind,
        state: b.state,
        start: b.start,
        finish: b.finish,
      },
    ];
  });
  const body = tradeCalendar(
    visits,
    [...new Set(trades.flatMap((t) => t.daysOff))],
    [
      ...jobs.map((j) => j.holidayRegion),
      ...workshops.map((w) => w.holidayRegion),
    ],
    range,
  );
  return {
    ...body,
    // In the order of their first visit (bookings come by start), so the workshops are named
    // soonest first and the same way every time.
    jobs: jobIds
      .flatMap((id) => {
        const j = jobById.get(id);
        return j ? [j] : [];
      })
      .map((j) => ({
        id: j.id,
        title: `${j.title}, ${j.area}`,
        workshopId: j.workshopId,
        workshopName: workshopName.get(j.workshopId) ?? "",
        taskCount: visits.filter((v) => v.jobId === j.id).length,
      })),
    trades: [],
  };
}
