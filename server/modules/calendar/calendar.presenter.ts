// The calendars' entries and day marks for a date range (issue 15), from rows and engine results
// the service has already loaded: pure, so the rules test without a database and the route's
// statement count never depends on them.
import {
  bankHolidayDays,
  type CalendarInput,
  type HolidayRegion,
} from "../../../shared/programme";
import {
  entriesOfTasks,
  entryInRange,
  lastDayOf,
  type BookingState,
  type CalendarEntry,
  type CalendarTask,
  type DayMark,
  type Party,
} from "../../../shared/schemas";
import { ACTIVE_STATES } from "../jobs/job-access";

export interface Range {
  from: string;
  to: string;
}

/** One job of a workshop or job calendar: its tasks, the engine's planned dates, its calendars. */
export interface PlannedJob {
  id: string;
  title: string;
  tasks: CalendarTask[];
  planned: readonly {
    id: string;
    plannedStart: string;
    plannedFinish: string;
  }[];
  /** The engine input's calendars: workshop, site, one per booked trade (`trade:<id>`). */
  calendars: readonly CalendarInput[];
  /** Business name of each booked trade, by trade id. */
  tradeNames: ReadonlyMap<string, string>;
}

const byStartThenId = (a: CalendarEntry, b: CalendarEntry) =>
  a.start.localeCompare(b.start) || a.id.localeCompare(b.id);

/** One mark per day and label, in date order (then label, so the answer is stable). */
function uniqueMarks(marks: DayMark[]): DayMark[] {
  const seen = new Map<string, DayMark>();
  for (const m of marks) {
    const key = `${m.date}:${m.label}`;
    if (!seen.has(key)) seen.set(key, m);
  }
  return [...seen.values()].sort(
    (a, b) => a.date.localeCompare(b.date) || a.label.localeCompare(b.label),
  );
}

const dayString = (day: number) =>
  new Date(day * 86_400_000).toISOString().slice(0, 10);

/**
 * The bank holidays of each region between `from` and `to` (inclusive), one mark a day: the
 * engine's own list (`bankHolidayDays`: date-holidays reconciled with GOV.UK), so a day the
 * calendar marks is a day the engine does not plan on.
 */
export function holidayMarks(
  regions: Iterable<HolidayRegion | null | undefined>,
  { from, to }: Range,
): DayMark[] {
  const days = new Set<string>();
  const first = Number(from.slice(0, 4));
  const last = Number(to.slice(0, 4));
  for (const region of new Set(regions)) {
    if (!region) continue;
    for (let y = first; y <= last; y++)
      for (const d of bankHolidayDays(region, y)) {
        const date = dayString(d);
        if (date >= from && date <= to) days.add(date);
      }
  }
  return [...days]
    .sort()
    .map((date) => ({ date, kind: "holiday", label: "Bank holiday" }));
}

/**
 * A workshop's or one job's calendar: every task with a day in the range on its planned dates,
 * and the marks of the calendars the engine planned them on — the regions' bank holidays, the
 * sites' closed days, the workshop's closed days and the booked trades' days off.
 */
export function planCalendar(
  jobs: readonly PlannedJob[],
  range: Range,
  extraRegions: readonly (HolidayRegion | null)[] = [],
): { entries: CalendarEntry[]; marks: DayMark[] } {
  const entries = jobs
    .flatMap((j) => entriesOfTasks(j, j.tasks, j.planned))
    .filter((e) => entryInRange(e, range.from, range.to))
    .sort(byStartThenId);
  const regions = new Set<HolidayRegion | null | undefined>(extraRegions);
  const marks: DayMark[] = [];
  for (const j of jobs)
    for (const c of j.calendars) {
      regions.add(c.holidayRegion);
      for (const d of c.daysOff ?? []) {
        if (d < range.from || d > range.to) continue;
        if (c.id === "site")
          marks.push({ date: d, kind: "closed", label: "Site closed" });
        else if (c.id.startsWith("trade:"))
          marks.push({
            date: d,
            kind: "day-off",
            label: `Day off: ${j.tradeNames.get(c.id.slice("trade:".length)) ?? "a trade"}`,
          });
        else marks.push({ date: d, kind: "day-off", label: "Workshop closed" });
      }
    }
  return {
    entries,
    marks: uniqueMarks([...marks, ...holidayMarks(regions, range)]),
  };
}

/** One of a trade's own bookings, with the job and workshop it is for. */
export interface Visit {
  bookingId: string;
  jobId: string;
  jobTitle: string;
  jobArea: string;
  workshopName: string;
  taskId: string;
  taskName: string | null;
  tradeKind: Party;
  state: BookingState;
  start: string;
  finish: string;
}

/**
 * A trade's own calendar: their bookings on their booked dates, as the job page shows them to a
 * trade — offered ones only (sent or later, still standing); a draft is the workshop's alone — and
 * their days off and the bank holidays of the regions they work in.
 */
export function tradeCalendar(
  visits: readonly Visit[],
  daysOff: readonly string[],
  regions: readonly (HolidayRegion | null)[],
  range: Range,
): { entries: CalendarEntry[]; marks: DayMark[] } {
  const entries = visits
    .filter((v) => ACTIVE_STATES.includes(v.state))
    .map((v): CalendarEntry => {
      const start = v.start.slice(0, 10);
      const last = lastDayOf(v.finish);
      return {
        id: `${v.jobId}:${v.bookingId}`,
        jobId: v.jobId,
        jobTitle: `${v.jobTitle}, ${v.jobArea}`,
        taskId: v.taskId,
        taskName: v.taskName ?? "Visit",
        party: v.tradeKind,
        who: v.workshopName,
        tradeId: null,
        state: v.state,
        start,
        last: last < start ? start : last,
        movable: false,
      };
    })
    .filter((e) => entryInRange(e, range.from, range.to))
    .sort(byStartThenId);
  const marks: DayMark[] = daysOff
    .filter((d) => d >= range.from && d <= range.to)
    .map((date) => ({ date, kind: "day-off", label: "Your day off" }));
  return {
    entries,
    marks: uniqueMarks([...marks, ...holidayMarks(regions, range)]),
  };
}
