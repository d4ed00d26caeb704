// Calendar entries as the FullCalendar views and the phone list draw them. The server builds the
// entries and day marks for the range in view (GET /api/calendar); the client only rebuilds the
// moving job's entries from a knock-on preview, with the same shared rule the server uses. Pure
// functions, so the events array is rebuilt only when its inputs change (FullCalendar snaps a
// dropped event back when it gets a new array for the same data).
import {
  addDays,
  entriesOfTasks,
  type CalendarEntry,
  type CalendarEntryState,
  type DayMark,
  type ProgrammeResponse,
} from "../../../shared/schemas";
import type { Preview } from "../../lib/knock-on";
import { bookingStateLabels, partyLabels } from "../../lib/labels";

export { addDays, type DayMark };

/** Booking state, or what an unbooked task is: the filter's values. */
export type EntryState = CalendarEntryState;

export const entryStateLabels: Record<EntryState, string> = {
  ...bookingStateLabels,
  "not-booked": "Not booked yet",
  workshop: "Workshop task",
};

export interface Entry extends CalendarEntry {
  /** Moved by the preview on screen (not saved). */
  previewed: boolean;
}

/** The days in view, both included. */
export interface DayRange {
  from: string;
  to: string;
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

/** The server's entries, as drawn (nothing previewed). */
export function asEntries(list: readonly CalendarEntry[]): Entry[] {
  return list.map((e) => ({ ...e, previewed: false }));
}

/**
 * The calendar's entries with one job's replaced by its programme under a knock-on preview:
 * the moved tasks on their previewed dates, marked as previewed. A draft booking is not in the
 * programme (it holds no dates), so a task the server named as a draft keeps that name.
 */
export function withPreview(
  entries: readonly Entry[],
  programme: ProgrammeResponse,
  jobTitle: string,
  preview: Preview,
): Entry[] {
  const moved = new Set(preview.impact.moves.map((m) => m.task));
  moved.add(preview.taskId);
  const drafts = new Map(
    entries
      .filter((e) => e.jobId === programme.jobId && e.state === "draft")
      .map((e) => [e.taskId, e]),
  );
  const jobEntries = entriesOfTasks(
    { id: programme.jobId, title: jobTitle },
    programme.tasks,
    preview.result.tasks,
  ).map((e) => {
    const draft = e.state === "not-booked" ? drafts.get(e.taskId) : undefined;
    return {
      ...e,
      ...(draft
        ? { state: draft.state, who: draft.who, tradeId: draft.tradeId }
        : {}),
      previewed: moved.has(e.taskId),
    };
  });
  return [...entries.filter((e) => e.jobId !== programme.jobId), ...jobEntries];
}

/** Monday of the week holding `date`. */
export function mondayOf(date: string): string {
  const wd = new Date(`${date}T00:00:00Z`).getUTCDay();
  return addDays(date, -((wd + 6) % 7));
}

/**
 * The days FullCalendar's month view shows first for `date` (weeks from Monday, six of them:
 * its fixed week count), so the first request asks for the range its first `datesSet` reports;
 * on a phone, the list's two weeks from this Monday.
 */
export function initialRange(date: string, wide: boolean): DayRange {
  if (!wide) {
    const from = mondayOf(date);
    return { from, to: addDays(from, 13) };
  }
  const from = mondayOf(`${date.slice(0, 8)}01`);
  return { from, to: addDays(from, 41) };
}

/** Today as "YYYY-MM-DD" in the browser's zone. */
export function todayDate(): string {
  const d = new Date();
  const p = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}`;
}
