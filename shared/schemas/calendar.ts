import { statesWhere } from "../bookings/lifecycle";
import { z } from "zod";
import {
  bookingStates,
  idSchema,
  isoDateSchema,
  partySchema,
  type BookingState,
  type Party,
} from "./common";

// The calendars' one date-range request (issue 15): the workshop's, a job's or a trade's own
// entries and day marks for the days in view, computed on the server. The entry rules below are
// shared because the client rebuilds one job's entries from a knock-on preview while dragging.

/** The longest range one request may ask for (a year and a month: the busiest view is a month). */
export const CALENDAR_MAX_DAYS = 400;

export const calendarScopes = ["workshop", "job", "me"] as const;
export type CalendarScope = (typeof calendarScopes)[number];

const DAY_MS = 86_400_000;

/** `date` moved by `n` calendar days ("YYYY-MM-DD", no time zone involved). */
export function addDays(date: string, n: number): string {
  return new Date(Date.parse(`${date}T00:00:00Z`) + n * DAY_MS)
    .toISOString()
    .slice(0, 10);
}

/** Days from `from` to `to`, both counted. */
export function daysInRange(from: string, to: string): number {
  return (
    Math.round(
      (Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) /
        DAY_MS,
    ) + 1
  );
}

export const CALENDAR_RANGE_WORDS = {
  order: "The range must end on or after the day it starts",
  tooLong: (n: number) =>
    `Ask for at most ${CALENDAR_MAX_DAYS} days at a time (this range is ${n} days)`,
  idNeeded: "Give the workshop's or the job's id",
  noId: "Your own calendar takes no id",
} as const;

/** GET /calendar?scope=workshop|job|me&id=…&from=YYYY-MM-DD&to=YYYY-MM-DD (inclusive). */
export const calendarQuerySchema = z
  .object({
    scope: z.enum(calendarScopes, {
      message: "Choose the workshop's, a job's or your own calendar",
    }),
    id: idSchema.optional(),
    from: isoDateSchema,
    to: isoDateSchema,
  })
  .superRefine((q, ctx) => {
    if (q.scope === "me" && q.id !== undefined)
      ctx.addIssue({
        code: "custom",
        path: ["id"],
        message: CALENDAR_RANGE_WORDS.noId,
      });
    if (q.scope !== "me" && q.id === undefined)
      ctx.addIssue({
        code: "custom",
        path: ["id"],
        message: CALENDAR_RANGE_WORDS.idNeeded,
      });
    if (q.to < q.from)
      ctx.addIssue({
        code: "custom",
        path: ["to"],
        message: CALENDAR_RANGE_WORDS.order,
      });
    else if (daysInRange(q.from, q.to) > CALENDAR_MAX_DAYS)
      ctx.addIssue({
        code: "custom",
        path: ["to"],
        message: CALENDAR_RANGE_WORDS.tooLong(daysInRange(q.from, q.to)),
      });
  });
export type CalendarQuery = z.output<typeof calendarQuerySchema>;

/** Booking state, or what an unbooked task is: the calendar filter's values. */
export const calendarEntryStates = [
  ...bookingStates,
  "not-booked",
  "workshop",
] as const;
export type CalendarEntryState = (typeof calendarEntryStates)[number];

export const calendarEntrySchema = z.object({
  id: z.string(),
  jobId: z.string(),
  jobTitle: z.string(),
  taskId: z.string(),
  taskName: z.string(),
  party: partySchema,
  /** The trade's business name once booked (or the workshop's name on a trade's calendar). */
  who: z.string().nullable(),
  /** The booked trade (the Business filter's value); null for workshop and unbooked tasks. */
  tradeId: z.string().nullable(),
  state: z.enum(calendarEntryStates),
  /** First day, "YYYY-MM-DD". */
  start: z.string(),
  /** Last day, inclusive. */
  last: z.string(),
  /** May be dragged or moved (not started, not done; never on a trade's own calendar). */
  movable: z.boolean(),
});
export type CalendarEntry = z.infer<typeof calendarEntrySchema>;

export const dayMarkKinds = ["holiday", "closed", "day-off", "busy"] as const;
export const dayMarkSchema = z.object({
  date: z.string(),
  kind: z.enum(dayMarkKinds),
  label: z.string(),
});
export type DayMark = z.infer<typeof dayMarkSchema>;

export const calendarResponseSchema = z.object({
  scope: z.enum(calendarScopes),
  from: z.string(),
  to: z.string(),
  /** Every entry with a day in the range (one that starts before it keeps its real start). */
  entries: z.array(calendarEntrySchema),
  /** Bank holidays, closed days and days off in the range, one per day and label, by date. */
  marks: z.array(dayMarkSchema),
  /** The jobs in scope, whether or not they have entries in the range (the Job filter). */
  jobs: z.array(
    z.object({
      id: z.string(),
      title: z.string(),
      workshopId: z.string(),
      workshopName: z.string(),
      taskCount: z.number().int(),
    }),
  ),
  /** The trades booked on those jobs (the Business filter); none on a trade's own calendar. */
  trades: z.array(z.object({ id: z.string(), name: z.string() })),
});
export type CalendarResponse = z.infer<typeof calendarResponseSchema>;

/** The last day an instant's work touches: a finish at the day's start belongs to the day before. */
export function lastDayOf(finish: string): string {
  const t = finish.length > 10 ? finish.slice(11, 16) : null;
  return t && t <= "08:00"
    ? addDays(finish.slice(0, 10), -1)
    : finish.slice(0, 10);
}

/** Booking states a workshop calendar draws on the booked task (the others leave it unbooked). */
export const calendarShownBookingStates: readonly BookingState[] =
  statesWhere("onCalendar");

/** One task of a programme with what the calendar needs of it and its booking. */
export interface CalendarTask {
  id: string;
  name: string;
  party: Party;
  actualStart: string | null;
  actualFinish: string | null;
  /** Its booking; the state is a `BookingState` (the programme response types it as a string). */
  booking: { state: string; tradeId: string; tradeName: string } | null;
}

/**
 * Every task of one job's programme as an entry, on the planned dates of `planned` (the
 * engine's result, or a knock-on preview's). The server builds the calendar with this and the
 * client rebuilds the moving job's entries with it while a drag's knock-on is on screen.
 */
export function entriesOfTasks(
  job: { id: string; title: string },
  tasks: readonly CalendarTask[],
  planned: readonly {
    id: string;
    plannedStart: string;
    plannedFinish: string;
  }[],
): CalendarEntry[] {
  const byId = new Map(planned.map((r) => [r.id, r]));
  const out: CalendarEntry[] = [];
  for (const t of tasks) {
    const r = byId.get(t.id);
    if (!r) continue;
    const state = t.booking?.state as BookingState | undefined;
    const booking =
      t.booking && state && calendarShownBookingStates.includes(state)
        ? { ...t.booking, state }
        : null;
    const start = r.plannedStart.slice(0, 10);
    const last = lastDayOf(r.plannedFinish);
    out.push({
      id: `${job.id}:${t.id}`,
      jobId: job.id,
      jobTitle: job.title,
      taskId: t.id,
      taskName: t.name,
      party: t.party,
      who: booking?.tradeName ?? null,
      tradeId: booking?.tradeId ?? null,
      state: booking
        ? booking.state
        : t.party === "workshop"
          ? "workshop"
          : "not-booked",
      start,
      last: last < start ? start : last,
      movable: !t.actualStart && !t.actualFinish,
    });
  }
  return out;
}

/** Whether an entry has a day between `from` and `to` (inclusive). */
export const entryInRange = (
  e: { start: string; last: string },
  from: string,
  to: string,
) => e.last >= from && e.start <= to;
