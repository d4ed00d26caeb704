// Calendar entries from programmes and bookings: what the FullCalendar views and the phone list
// draw. Pure functions, so the events array is rebuilt only when its inputs change (FullCalendar
// snaps a dropped event back when it gets a new array for the same data).
import { isWorkingDay, type ProgrammeResult } from "../../../shared/programme";
import type {
  BookingState,
  BookingView,
  JobDetail,
  Party,
  ProgrammeResponse,
} from "../../../shared/schemas";
import { engineInput, timeOf, type Preview } from "../../lib/knock-on";
import { bookingStateLabels, partyLabels } from "../../lib/labels";

/** Booking state, or what an unbooked task is: the filter's values. */
export type EntryState = BookingState | "not-booked" | "workshop";

export const entryStateLabels: Record<EntryState, string> = {
  ...bookingStateLabels,
  "not-booked": "Not booked yet",
  workshop: "Workshop task",
};

export interface Entry {
  id: string;
  jobId: string;
  jobTitle: string;
  taskId: string;
  taskName: string;
  party: Party;
  /** The trade's business name once booked (or the workshop's name on a trade's calendar). */
  who: string | null;
  state: EntryState;
  /** First day, "YYYY-MM-DD". */
  start: string;
  /** Last day, inclusive. */
  last: string;
  /** May be dragged or moved (not started, not done). */
  movable: boolean;
  /** Moved by the preview on screen (not saved). */
  previewed: boolean;
}

export interface DayMark {
  date: string;
  kind: "holiday" | "closed" | "day-off" | "busy";
  label: string;
}

const DAY_MS = 86_400_000;
export function addDays(date: string, n: number): string {
  return new Date(Date.parse(`${date}T00:00:00Z`) + n * DAY_MS)
    .toISOString()
    .slice(0, 10);
}

/** The last day an instant's work touches: a finish at the day's start belongs to the day before. */
export function lastDayOf(finish: string): string {
  const t = timeOf(finish);
  return t && t <= "08:00"
    ? addDays(finish.slice(0, 10), -1)
    : finish.slice(0, 10);
}

/** "Plasterer · Template coving" — the text label every event carries (never colour alone). */
export function entryLabel(e: Entry): string {
  return `${partyLabels[e.party]} · ${e.taskName}`;
}

/** The longer line: who, which job, which state. */
export function entryDetail(e: Entry): string {
  return [e.who, e.jobTitle, entryStateLabels[e.state]]
    .filter(Boolean)
    .join(" · ");
}

const SHOWN_BOOKINGS: BookingState[] = [
  "draft",
  "sent",
  "confirmed",
  "date-proposed",
  "needs-reconfirming",
];

/** Every task of a job's programme as an entry, on the planned dates of `result`. */
export function entriesOfProgramme(
  p: ProgrammeResponse,
  jobTitle: string,
  preview: Preview | null,
): Entry[] {
  const result: ProgrammeResult = preview?.result ?? p.result;
  const moved = new Set(preview?.impact.moves.map((m) => m.task) ?? []);
  if (preview) moved.add(preview.taskId);
  const byId = new Map(result.tasks.map((r) => [r.id, r]));
  const out: Entry[] = [];
  for (const t of p.tasks) {
    const r = byId.get(t.id);
    if (!r) continue;
    const booking =
      t.booking && SHOWN_BOOKINGS.includes(t.booking.state as BookingState)
        ? t.booking
        : null;
    const start = r.plannedStart.slice(0, 10);
    const last = lastDayOf(r.plannedFinish);
    out.push({
      id: `${p.jobId}:${t.id}`,
      jobId: p.jobId,
      jobTitle,
      taskId: t.id,
      taskName: t.name,
      party: t.party,
      who: booking?.tradeName ?? null,
      state: booking
        ? (booking.state as BookingState)
        : t.party === "workshop"
          ? "workshop"
          : "not-booked",
      start,
      last: last < start ? start : last,
      movable: !t.actualStart && !t.actualFinish,
      previewed: moved.has(t.id),
    });
  }
  return out;
}

/** A trade's own bookings on one job (the job detail a trade sees lists only theirs). */
export function entriesOfJobBookings(job: JobDetail): Entry[] {
  const names = new Map(job.tasks.map((t) => [t.id, t.name]));
  return job.bookings
    .filter((b: BookingView) => SHOWN_BOOKINGS.includes(b.state))
    .map((b) => {
      const start = b.start.slice(0, 10);
      const last = lastDayOf(b.finish);
      return {
        id: `${job.id}:${b.id}`,
        jobId: job.id,
        jobTitle: `${job.title}, ${job.area}`,
        taskId: b.taskId,
        taskName: names.get(b.taskId) ?? "Visit",
        party: b.tradeKind,
        who: job.workshopName,
        state: b.state,
        start,
        last: last < start ? start : last,
        movable: false,
        previewed: false,
      };
    });
}

/** Bank holidays, site-closed days and trades' days off between `from` and `to` (inclusive). */
export function dayMarks(
  programmes: ProgrammeResponse[],
  from: string,
  to: string,
): DayMark[] {
  const marks = new Map<string, DayMark>();
  const put = (m: DayMark) => {
    const key = `${m.date}:${m.label}`;
    if (!marks.has(key)) marks.set(key, m);
  };
  const regions = new Set<string>();
  for (const p of programmes) {
    const input = engineInput(p);
    const tradeNames = new Map(
      p.tasks
        .filter((t) => t.booking)
        .map((t) => [`trade:${t.booking!.tradeId}`, t.booking!.tradeName]),
    );
    for (const c of input.calendars ?? []) {
      if (c.holidayRegion) regions.add(c.holidayRegion);
      for (const d of c.daysOff ?? []) {
        if (d < from || d > to) continue;
        if (c.id === "site")
          put({ date: d, kind: "closed", label: "Site closed" });
        else if (c.id.startsWith("trade:"))
          put({
            date: d,
            kind: "day-off",
            label: `Day off: ${tradeNames.get(c.id) ?? "a trade"}`,
          });
        else put({ date: d, kind: "day-off", label: "Workshop closed" });
      }
    }
  }
  for (const m of holidayMarks([...regions], from, to)) put(m);
  return [...marks.values()].sort((a, b) => a.date.localeCompare(b.date));
}

/** The bank holidays of each region between `from` and `to` (inclusive), once per day. */
export function holidayMarks(
  regions: string[],
  from: string,
  to: string,
): DayMark[] {
  const days = new Set<string>();
  for (const region of new Set(regions)) {
    // Every weekday working, so only the region's bank holidays are days off.
    const cal = {
      id: "holidays",
      workingWeekdays: [1, 2, 3, 4, 5, 6, 7],
      holidayRegion: region as never,
    };
    for (let d = from; d <= to; d = addDays(d, 1))
      if (!isWorkingDay([cal], d)) days.add(d);
  }
  return [...days]
    .sort()
    .map((date) => ({ date, kind: "holiday", label: "Bank holiday" }));
}

/** Monday of the week holding `date`. */
export function mondayOf(date: string): string {
  const wd = new Date(`${date}T00:00:00Z`).getUTCDay();
  return addDays(date, -((wd + 6) % 7));
}

/** Today as "YYYY-MM-DD" in the browser's zone. */
export function todayDate(): string {
  const d = new Date();
  const p = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}`;
}
