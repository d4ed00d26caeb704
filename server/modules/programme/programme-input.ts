import { In, Not, type EntityManager } from "typeorm";
import type {
  BusyInput,
  CalendarInput,
  ProgrammeInput,
  TaskInput,
} from "../../../shared/programme";
import { Booking } from "../bookings/bookings.entity";
import type { Job } from "../jobs/jobs.entity";
import { localToday } from "../jobs/jobs.presenter";
import { Trade, TradeMember } from "../trades/trades.entity";
import type { Workshop } from "../workshops/workshops.entity";
import { Task, TaskLink } from "./programme.entity";

/** Booking states that hold the trade's dates: the engine treats them as pins. */
export const PINNING_STATES = [
  "sent",
  "confirmed",
  "date-proposed",
  "needs-reconfirming",
] as const;

export interface ProgrammeData {
  tasks: Task[];
  links: TaskLink[];
  /** The booking that holds each task, if any (latest pinning one). */
  bookingByTask: Map<string, Booking>;
  trades: Map<string, Trade>;
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
  const [tasks, links, bookings] = await Promise.all([
    m.find(Task, { where: { jobId: job.id }, order: { sortOrder: "ASC" } }),
    m.find(TaskLink, { where: { jobId: job.id } }),
    m.find(Booking, {
      where: { jobId: job.id, state: In([...PINNING_STATES]) },
      order: { updatedAt: "ASC" },
    }),
  ]);
  const bookingByTask = new Map(bookings.map((b) => [b.taskId, b]));
  const tradeIds = [...new Set(bookings.map((b) => b.tradeId))];
  const tradeList = tradeIds.length
    ? await m.findBy(Trade, { id: In(tradeIds) })
    : [];
  const trades = new Map(tradeList.map((t) => [t.id, t]));
  // Resource ids double as the name in clash messages ("Ashby Plaster & Coving is already booked …").
  const resourceOf = new Map<string, string>();
  const used = new Set<string>();
  for (const t of tradeList) {
    let name = t.businessName;
    for (let k = 2; used.has(name); k++) name = `${t.businessName} (${k})`;
    used.add(name);
    resourceOf.set(t.id, name);
  }

  const calendars: CalendarInput[] = [
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
      id: `trade:${t.id}`,
      workingWeekdays: t.workingWeekdays,
      dayStart: t.dayStart,
      dayEnd: t.dayEnd,
      holidayRegion: job.holidayRegion,
      daysOff: t.daysOff,
    })),
  ];

  const taskInputs: TaskInput[] = tasks.map((t) => {
    const booking = bookingByTask.get(t.id);
    const calendar =
      t.party === "workshop"
        ? ["workshop", "site"]
        : booking
          ? [`trade:${booking.tradeId}`, "site"]
          : ["site"];
    return {
      id: t.id,
      name: t.name,
      calendar,
      durationDays: Number(t.durationDays),
      resource: booking ? resourceOf.get(booking.tradeId) : null,
      notEarlierThan: t.notEarlierThan,
      bookedStart: booking && !t.actualStart ? booking.start : null,
      actualStart: t.actualStart,
      actualFinish: t.actualFinish,
    };
  });

  const busy: BusyInput[] = [];
  for (const t of tradeList)
    busy.push(...(await tradeBusy(m, t, job.id, resourceOf.get(t.id)!)));

  const input: ProgrammeInput = {
    timeZone: job.timeZone,
    dataDate: localToday(job.timeZone, now),
    handover: job.handoverDate,
    calendars,
    tasks: taskInputs,
    links: links.map((l) => ({
      from: l.fromTaskId,
      to: l.toTaskId,
      kind: l.kind,
      lag: Number(l.lag),
      lagUnit: l.lagUnit,
    })),
    busy,
  };
  return { tasks, links, bookingByTask, trades, input };
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
