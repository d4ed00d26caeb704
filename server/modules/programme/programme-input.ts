import { statesWhere } from "../../../shared/bookings/lifecycle";
import { In, Not, type EntityManager } from "typeorm";
import type { BusyInput, ProgrammeInput } from "../../../shared/programme";
import {
  type ProgrammeEngine,
  linkEngineInput,
  taskEngineInput,
  tradeCalendarId,
} from "../../../shared/schemas";
import { Booking } from "../bookings/bookings.entity";
import type { Job } from "../jobs/jobs.entity";
import { localToday } from "../jobs/jobs.presenter";
import { Trade, TradeMember } from "../trades/trades.entity";
import type { Workshop } from "../workshops/workshops.entity";
import { Task, TaskLink } from "./programme.entity";

/** Booking states that hold the trade's dates: the engine treats them as pins (the lifecycle table). */
export const PINNING_STATES = statesWhere("holdsDates");

export interface ProgrammeData {
  tasks: Task[];
  links: TaskLink[];
  /** The booking that holds each task, if any (latest pinning one). */
  bookingByTask: Map<string, Booking>;
  trades: Map<string, Trade>;
  /** What the engine needs beyond the tasks and links (calendars, busy time, resource names). */
  engine: ProgrammeEngine;
  input: ProgrammeInput;
}

/**
 * Builds the engine's input for one job. Calendars: the workshop's own; the site's access calendar
 * (the job's nation for bank holidays, the weekdays the customer lets trades in, the days they are
 * away); one per booked trade. A workshop task works when the workshop and the site both do; a
 * booked trade task when that trade and the site do; an unbooked trade task on the site's days.
 * Busy intervals: the booked trades' other bookings on every other job of the workshop.
 */
export async function loadProgramme(
  m: EntityManager,
  job: Job,
  workshop: Workshop,
  now = new Date(),
): Promise<ProgrammeData> {
  return (await loadProgrammes(m, [job], [workshop], now)).get(job.id)!;
}

/**
 * `loadProgramme` for many jobs at once, in a fixed number of statements however many jobs there
 * are (at most eight: tasks, links, bookings, trades, the trades' bookings, and the people behind
 * the trades with their bookings for other workshops). The attention list, feeds and timeline use
 * this; a per-job loop of `loadProgramme` costs eight statements a job (issue 15).
 */
export async function loadProgrammes(
  m: EntityManager,
  jobs: readonly Job[],
  workshops: readonly Workshop[],
  now = new Date(),
): Promise<Map<string, ProgrammeData>> {
  const out = new Map<string, ProgrammeData>();
  if (!jobs.length) return out;
  const jobIds = jobs.map((j) => j.id);
  const workshopById = new Map(workshops.map((w) => [w.id, w]));
  const [tasks, links, bookings] = await Promise.all([
    m.find(Task, {
      where: { jobId: In(jobIds) },
      order: { sortOrder: "ASC" },
    }),
    m.find(TaskLink, { where: { jobId: In(jobIds) } }),
    m.find(Booking, {
      where: { jobId: In(jobIds), state: In([...PINNING_STATES]) },
      order: { updatedAt: "ASC" },
    }),
  ]);
  const tradeIds = [...new Set(bookings.map((b) => b.tradeId))];
  const tradeList = tradeIds.length
    ? await m.findBy(Trade, { id: In(tradeIds) })
    : [];
  const busyOf = await busyByTrade(m, tradeList);

  const tasksOf = groupBy(tasks, (t) => t.jobId);
  const linksOf = groupBy(links, (l) => l.jobId);
  const bookingsOf = groupBy(bookings, (b) => b.jobId);
  const tradeById = new Map(tradeList.map((t) => [t.id, t]));
  for (const job of jobs) {
    const workshop = workshopById.get(job.workshopId);
    if (!workshop)
      throw new Error(`loadProgrammes: workshop of job ${job.id} not given`);
    const jobBookings = bookingsOf.get(job.id) ?? [];
    const jobTradeIds = [...new Set(jobBookings.map((b) => b.tradeId))];
    const jobTrades = jobTradeIds
      .map((id) => tradeById.get(id))
      .filter((t): t is Trade => t !== undefined);
    out.set(
      job.id,
      programmeData(
        job,
        workshop,
        tasksOf.get(job.id) ?? [],
        linksOf.get(job.id) ?? [],
        jobBookings,
        jobTrades,
        busyOf,
        now,
      ),
    );
  }
  return out;
}

function groupBy<T>(
  items: readonly T[],
  key: (t: T) => string,
): Map<string, T[]> {
  const map = new Map<string, T[]>();
  for (const item of items) {
    const k = key(item);
    const list = map.get(k);
    if (list) list.push(item);
    else map.set(k, [item]);
  }
  return map;
}

/** One job's data and engine input, from rows already loaded (no statements). */
function programmeData(
  job: Job,
  workshop: Workshop,
  tasks: Task[],
  links: TaskLink[],
  bookings: Booking[],
  tradeList: Trade[],
  busyOf: Map<string, TradeBusyRow[]>,
  now: Date,
): ProgrammeData {
  const bookingByTask = new Map(bookings.map((b) => [b.taskId, b]));
  const trades = new Map(tradeList.map((t) => [t.id, t]));
  // Resource ids double as the name in clash messages ("Ashby Plaster & Coving is already booked …").
  const resources: Record<string, string> = {};
  const used = new Set<string>();
  for (const t of tradeList) {
    let name = t.businessName;
    for (let k = 2; used.has(name); k++) name = `${t.businessName} (${k})`;
    used.add(name);
    resources[t.id] = name;
  }

  const calendars: ProgrammeEngine["calendars"] = [
    {
      id: "workshop",
      workingWeekdays: workshop.workingWeekdays,
      dayStart: workshop.dayStart,
      dayEnd: workshop.dayEnd,
      holidayRegion: workshop.holidayRegion,
      daysOff: [],
    },
    {
      id: "site",
      workingWeekdays: job.siteWeekdays,
      dayStart: workshop.dayStart,
      dayEnd: workshop.dayEnd,
      holidayRegion: job.holidayRegion,
      daysOff: job.siteClosedDates,
    },
    ...tradeList.map((t) => ({
      id: tradeCalendarId(t.id),
      workingWeekdays: t.workingWeekdays,
      dayStart: t.dayStart,
      dayEnd: t.dayEnd,
      holidayRegion: job.holidayRegion,
      daysOff: t.daysOff,
    })),
  ];

  // The one rule for a task's calendars, resource and pin, shared with the client's rebuild.
  const taskInputs = tasks.map((t) => {
    const booking = bookingByTask.get(t.id);
    return taskEngineInput(
      {
        id: t.id,
        name: t.name,
        party: t.party,
        durationDays: Number(t.durationDays),
        notEarlierThan: t.notEarlierThan,
        actualStart: t.actualStart,
        actualFinish: t.actualFinish,
        booking: booking
          ? { tradeId: booking.tradeId, start: booking.start }
          : null,
      },
      resources,
    );
  });

  const busy: ProgrammeEngine["busy"] = [];
  for (const t of tradeList) {
    const resource = resources[t.id];
    for (const row of busyOf.get(t.id) ?? [])
      if (row.jobId !== job.id)
        busy.push({
          resource,
          start: row.start,
          finish: row.finish,
          ref: row.ref,
        });
  }

  const input: ProgrammeInput = {
    timeZone: job.timeZone,
    dataDate: localToday(job.timeZone, now),
    handover: job.handoverDate,
    calendars,
    tasks: taskInputs,
    links: links.map((l) => linkEngineInput({ ...l, lag: Number(l.lag) })),
    busy,
  };
  return {
    tasks,
    links,
    bookingByTask,
    trades,
    engine: { calendars, busy, resources },
    input,
  };
}

/** A trade's dates held elsewhere: `jobId` is null for another workshop's booking. */
interface TradeBusyRow {
  jobId: string | null;
  start: string;
  finish: string;
  ref: string;
}

/**
 * Each trade's pinning bookings, in four statements for any number of trades: its own on this
 * workshop's jobs (named by job; a caller drops the job it is planning), and — when the person who
 * speaks for the trade also works for other workshops — their bookings there, shown only as "busy
 * for another workshop" (another workshop's job, customer and address stay theirs).
 */
async function busyByTrade(
  m: EntityManager,
  trades: readonly Trade[],
): Promise<Map<string, TradeBusyRow[]>> {
  const out = new Map<string, TradeBusyRow[]>(trades.map((t) => [t.id, []]));
  if (!trades.length) return out;
  const tradeIds = trades.map((t) => t.id);
  const [own, people] = await Promise.all([
    m.find(Booking, {
      where: { tradeId: In(tradeIds), state: In([...PINNING_STATES]) },
      relations: { job: true },
    }),
    m.find(TradeMember, {
      where: { tradeId: In(tradeIds) },
      select: { userId: true, tradeId: true },
    }),
  ]);
  for (const b of own)
    out.get(b.tradeId)!.push({
      jobId: b.jobId,
      start: b.start,
      finish: b.finish,
      ref: b.job?.title ?? "another job",
    });
  if (!people.length) return out;
  const links = await m.find(TradeMember, {
    where: { userId: In([...new Set(people.map((p) => p.userId))]) },
    select: { userId: true, tradeId: true, workshopId: true },
  });
  // Trades of other workshops already in `own` (a batch across workshops) are not read twice.
  const elsewhereIds = [...new Set(links.map((l) => l.tradeId))].filter(
    (id) => !out.has(id),
  );
  const theirs = elsewhereIds.length
    ? await m.find(Booking, {
        where: { tradeId: In(elsewhereIds), state: In([...PINNING_STATES]) },
      })
    : [];
  const workshopOfTrade = new Map(trades.map((t) => [t.id, t.workshopId]));
  const byTradeElsewhere = groupBy([...own, ...theirs], (b) => b.tradeId);
  const usersOf = groupBy(people, (p) => p.tradeId);
  for (const t of trades) {
    const mine = new Set((usersOf.get(t.id) ?? []).map((p) => p.userId));
    const others = new Set(
      links
        .filter(
          (l) =>
            mine.has(l.userId) &&
            l.workshopId !== workshopOfTrade.get(t.id) &&
            l.tradeId !== t.id,
        )
        .map((l) => l.tradeId),
    );
    for (const id of others)
      for (const b of byTradeElsewhere.get(id) ?? [])
        out.get(t.id)!.push({
          jobId: null,
          start: b.start,
          finish: b.finish,
          ref: "busy for another workshop",
        });
  }
  return out;
}

/**
 * A trade's other bookings, as `busy` for the engine: on this workshop's other jobs (named by
 * job), and — when the person who speaks for the trade also works for other workshops — their
 * bookings there, shown only as "busy" (another workshop's job, customer and address stay theirs).
 */
export async function tradeBusy(
  m: EntityManager,
  trade: Trade,
  excludeJobId: string,
  resource: string,
): Promise<BusyInput[]> {
  const own = await m.find(Booking, {
    where: {
      tradeId: trade.id,
      jobId: Not(excludeJobId),
      state: In([...PINNING_STATES]),
    },
    relations: { job: true },
  });
  const busy: BusyInput[] = own.map((b) => ({
    resource,
    start: b.start,
    finish: b.finish,
    ref: b.job?.title ?? "another job",
  }));
  const people = await m.find(TradeMember, {
    where: { tradeId: trade.id },
    select: { userId: true },
  });
  if (people.length) {
    const links = await m.find(TradeMember, {
      where: {
        userId: In(people.map((p) => p.userId)),
        workshopId: Not(trade.workshopId),
      },
      select: { tradeId: true },
    });
    const elsewhere = [...new Set(links.map((l) => l.tradeId))];
    if (elsewhere.length) {
      const theirs = await m.find(Booking, {
        where: { tradeId: In(elsewhere), state: In([...PINNING_STATES]) },
      });
      for (const b of theirs)
        busy.push({
          resource,
          start: b.start,
          finish: b.finish,
          ref: "busy for another workshop",
        });
    }
  }
  return busy;
}
