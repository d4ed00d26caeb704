// The instant knock-on of a proposed move, shared by the programme screen and the calendars:
// the same engine the server runs, on the exact input it scheduled, with one field changed.
import {
  impactOf,
  scheduleProgramme,
  type Impact,
  type ProgrammeInput,
  type ProgrammeResult,
} from "../../shared/programme";
import { engineInputOf, type ProgrammeResponse } from "../../shared/schemas";
import { formatDateShort } from "./format";

// A cached programme is never changed in place (an edit makes a new object), so its input can be
// rebuilt once and kept for as long as the object lives.
const inputs = new WeakMap<ProgrammeResponse, ProgrammeInput>();

/** The exact engine input the server scheduled, rebuilt from the response (`engineInputOf`). */
export function engineInput(p: ProgrammeResponse): ProgrammeInput {
  let input = inputs.get(p);
  if (!input) {
    input = engineInputOf(p);
    inputs.set(p, input);
  }
  return input;
}

/** The date part of a local instant ("2026-03-05T12:00" → "2026-03-05"). */
export const dateOf = (instant: string) => instant.slice(0, 10);
export const timeOf = (instant: string) =>
  instant.length > 10 ? instant.slice(11, 16) : null;

/** "Thu 14 Jan" (the year only when it is not this year). */
export const dayText = (instant: string) => formatDateShort(dateOf(instant));

/** A planned start in words: "Thu 14 Jan", or "Thu 14 Jan, afternoon" from midday. */
export function startText(instant: string): string {
  const t = timeOf(instant);
  if (t && t >= "12:00" && t < "14:00") return `${dayText(instant)}, afternoon`;
  if (t && t >= "14:00") return `${dayText(instant)}, end of day`;
  return dayText(instant);
}

/** A planned finish in words: "Fri 15 Jan", or "Fri 15 Jan, midday" when it ends at 12:00. */
export function finishText(instant: string): string {
  const t = timeOf(instant);
  if (t === "12:00") return `${dayText(instant)}, midday`;
  if (t && t < "12:00") return `${dayText(instant)}, start of day`;
  return dayText(instant);
}

export function workingDaysText(n: number): string {
  const v = Number.isInteger(n) ? String(n) : n.toFixed(1).replace(/\.0$/, "");
  return `${v} working ${Math.abs(n) === 1 ? "day" : "days"}`;
}

export interface Preview {
  taskId: string;
  notEarlierThan: string;
  result: ProgrammeResult;
  impact: Impact;
}

/**
 * The knock-on of starting `taskId` no earlier than `date`: the same engine the server runs, on
 * the exact input it scheduled, with that one field changed. No round trip, so it keeps up with
 * a drag.
 */
export function previewMove(
  p: ProgrammeResponse,
  taskId: string,
  date: string,
): Preview {
  const before = engineInput(p);
  const after: ProgrammeInput = {
    ...before,
    tasks: before.tasks.map((t) =>
      t.id === taskId ? { ...t, notEarlierThan: date } : t,
    ),
  };
  return {
    taskId,
    notEarlierThan: date,
    result: scheduleProgramme(after),
    impact: impactOf(before, after),
  };
}
