// Pure helpers for the programme screen: words for links and dates, bar geometry, and the
// instant what-if that re-runs the shared engine on the exact input the server scheduled.
import {
  isWorkingDay,
  type CalendarInput,
  type LagUnit,
  type LinkKind,
  type ProgrammeInput,
  type ProgrammeResult,
  type TaskResult,
} from "../../../shared/programme";
import type { ProgrammeResponse, ProgrammeTask } from "../../../shared/schemas";
import { partyLabels } from "../../lib/labels";

export {
  dateOf,
  dayText,
  engineInput,
  finishText,
  previewMove,
  startText,
  timeOf,
  workingDaysText,
  type Preview,
} from "../../lib/knock-on";
import { dateOf, timeOf, workingDaysText } from "../../lib/knock-on";

export type ProgrammeLink = ProgrammeResponse["links"][number];

/** "2 days", "0.5 days", "1 day". */
export function daysText(n: number): string {
  const v = Number.isInteger(n) ? String(n) : n.toFixed(1).replace(/\.0$/, "");
  return `${v} ${Math.abs(n) === 1 ? "day" : "days"}`;
}

/** The link kinds in the form's words: what the waiting task waits for. */
export const linkKindWords: Record<LinkKind, string> = {
  FS: "after it finishes",
  SS: "after it starts",
  FF: "finishes after it finishes",
};
export const linkKindTerms: Record<LinkKind, string> = {
  FS: "finish-to-start",
  SS: "start-to-start",
  FF: "finish-to-finish",
};
export const lagUnitWords: Record<LagUnit, string> = {
  workingDays: "working days",
  elapsedHours: "hours — drying",
};

/** "2 working days after", "24 hours after — drying", "1 working day before"; "" for no lag. */
export function lagText(lag: number, unit: LagUnit): string {
  if (lag === 0) return "";
  const n = Math.abs(lag);
  const side = lag > 0 ? "after" : "before";
  return unit === "workingDays"
    ? `${workingDaysText(n)} ${side}`
    : `${n} ${n === 1 ? "hour" : "hours"} ${side}${lag > 0 ? " — drying" : ""}`;
}

/** "Waits for Fix carcasses & scribes — finish-to-start, 2 working days after". */
export function waitsForText(link: ProgrammeLink, fromName: string): string {
  const lag = lagText(link.lag, link.lagUnit);
  return `Waits for ${fromName} — ${linkKindTerms[link.kind]}${lag ? `, ${lag}` : ""}`;
}

/** The party as the person knows it: the trade's name once booked, else the kind. */
export function partyText(task: ProgrammeTask): string {
  return task.booking?.tradeName || partyLabels[task.party];
}

export interface Row {
  task: ProgrammeTask;
  result: TaskResult;
}

/** Tasks with their results, ordered by planned start (then the stored order). */
export function rowsOf(tasks: ProgrammeTask[], result: ProgrammeResult): Row[] {
  const byId = new Map(result.tasks.map((r) => [r.id, r]));
  return tasks
    .filter((t) => byId.has(t.id))
    .map((t) => ({ task: t, result: byId.get(t.id)! }))
    .sort(
      (a, b) =>
        a.result.plannedStart.localeCompare(b.result.plannedStart) ||
        a.result.plannedFinish.localeCompare(b.result.plannedFinish) ||
        a.task.sortOrder - b.task.sortOrder,
    );
}

// ---- days and the bar view ----------------------------------------------------------------

const DAY_MS = 86_400_000;
/** Days since 1970-01-01 for "YYYY-MM-DD" (calendar arithmetic, no time zone involved). */
export function dayNumber(date: string): number {
  return Math.round(Date.parse(`${date}T00:00:00Z`) / DAY_MS);
}
export function dateOfDay(n: number): string {
  return new Date(n * DAY_MS).toISOString().slice(0, 10);
}
export function addDays(date: string, n: number): string {
  return dateOfDay(dayNumber(date) + n);
}
export function isoWeekday(date: string): number {
  const d = new Date(`${date}T00:00:00Z`).getUTCDay();
  return d === 0 ? 7 : d;
}

/** The calendars a task works on (a list intersects), as the engine sees them. */
export function taskCalendars(
  input: ProgrammeInput,
  taskId: string,
): CalendarInput[] {
  const task = input.tasks.find((t) => t.id === taskId);
  const all = input.calendars ?? [];
  const ids = task?.calendar
    ? Array.isArray(task.calendar)
      ? task.calendar
      : [task.calendar]
    : ["workshop"];
  const list = ids
    .map((id) => all.find((c) => c.id === id))
    .filter((c): c is CalendarInput => !!c);
  return list.length ? list : all.slice(0, 1);
}

/** The working hours of a list of calendars: latest start, earliest end (engine convention). */
export function hoursOf(calendars: CalendarInput[]): {
  start: number;
  end: number;
} {
  const mins = (s: string) =>
    Number(s.slice(0, 2)) * 60 + Number(s.slice(3, 5));
  let start = mins("08:00");
  let end = mins("16:30");
  if (calendars.length) {
    start = Math.max(...calendars.map((c) => mins(c.dayStart ?? "08:00")));
    end = Math.min(...calendars.map((c) => mins(c.dayEnd ?? "16:30")));
  }
  return { start, end };
}

/** A working-day test per task, cached for the days the bar view shows. */
export function workingDayTest(
  input: ProgrammeInput,
  taskId: string,
): (date: string) => boolean {
  const cals = taskCalendars(input, taskId);
  const cache = new Map<string, boolean>();
  return (date) => {
    let v = cache.get(date);
    if (v === undefined) {
      v = cals.length ? isWorkingDay(cals, date) : isoWeekday(date) <= 5;
      cache.set(date, v);
    }
    return v;
  };
}

/**
 * Where an instant sits across the day columns, in days from `firstDay`: a day's morning is its
 * first half, its afternoon the second, so a half-day slot is always half a column.
 */
export function positionOf(
  instant: string,
  firstDay: number,
  hours: { start: number; end: number },
): number {
  const day = dayNumber(dateOf(instant)) - firstDay;
  const t = timeOf(instant);
  if (!t) return day;
  const m = Number(t.slice(0, 2)) * 60 + Number(t.slice(3, 5));
  const noon = 12 * 60;
  let f: number;
  if (m <= hours.start) f = 0;
  else if (m < noon) f = (0.5 * (m - hours.start)) / (noon - hours.start);
  else if (m < hours.end) f = 0.5 + (0.5 * (m - noon)) / (hours.end - noon);
  else f = 1;
  return day + f;
}

/** The working stretches of a bar between two positions, skipping the task's days off. */
export function segmentsOf(
  from: number,
  to: number,
  firstDay: number,
  works: (date: string) => boolean,
): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  if (to <= from) return out;
  for (let d = Math.floor(from); d < Math.ceil(to); d++) {
    if (!works(dateOfDay(firstDay + d))) continue;
    const a = Math.max(from, d);
    const b = Math.min(to, d + 1);
    const last = out[out.length - 1];
    if (last && last[1] === a) last[1] = b;
    else out.push([a, b]);
  }
  // A bar that lies wholly on days off (a pin on a closed day) still shows where it is.
  if (out.length === 0) out.push([from, to]);
  return out;
}

/** The next working day after (or before, for step −1) `date` on the task's calendar. */
export function stepWorkingDay(
  date: string,
  step: 1 | -1,
  works: (date: string) => boolean,
): string {
  let d = addDays(date, step);
  for (let i = 0; i < 60 && !works(d); i++) d = addDays(d, step);
  return d;
}
