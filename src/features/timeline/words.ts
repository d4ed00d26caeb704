// The timeline in the customer's words (brief, Words: "visit", "handover"; Look and feel: dates
// with the weekday, times on the 24-hour clock). No booking states, no float.
import { partyTitle } from "../../../shared/words/trades";
import type { TimelineVisit, VisitArrival } from "../../../shared/schemas";
import { formatDateShort } from "../../lib/format";

/** "Plasterer — Ashby Plaster & Coving"; the workshop's own visits by the workshop's name. */
export function whoWords(v: Pick<TimelineVisit, "party" | "businessName">) {
  return v.party === "workshop"
    ? v.businessName
    : `${partyTitle(v.party)} — ${v.businessName}`;
}

/** "Thu 14 Jan" (the year only outside this year). */
export const dayWords = (local: string) => formatDateShort(local.slice(0, 10));

/** "Thu 14 Jan", or "Mon 11 Jan – Tue 12 Jan". */
export function daysWords(start: string, finish: string): string {
  const a = start.slice(0, 10);
  const b = finish.slice(0, 10);
  return a === b ? dayWords(a) : `${dayWords(a)} – ${dayWords(b)}`;
}

/** "Morning", "Afternoon", "All day", "08:00–09:00". */
export function arrivalWords(a: VisitArrival): string {
  switch (a.window) {
    case "morning":
      return "Morning";
    case "afternoon":
      return "Afternoon";
    case "all-day":
      return "All day";
    case "range":
      return a.from && a.to ? `${a.from}–${a.to}` : "Time to be agreed";
  }
}

/** What changed, in a few words: "was Tue 12 Jan, afternoon". */
export function wasWords(
  now: Pick<TimelineVisit, "start" | "finish" | "arrival">,
  was: Pick<TimelineVisit, "start" | "finish" | "arrival">,
): string {
  const daysNow = daysWords(now.start, now.finish);
  const daysWas = daysWords(was.start, was.finish);
  const arrivalNow = arrivalWords(now.arrival);
  const arrivalWas = arrivalWords(was.arrival);
  if (daysNow !== daysWas && arrivalNow !== arrivalWas)
    return `was ${daysWas}, ${arrivalWas.toLowerCase()}`;
  if (daysNow !== daysWas) return `was ${daysWas}`;
  return `arrival was ${/^\d/.test(arrivalWas) ? arrivalWas : arrivalWas.toLowerCase()}`;
}

/** "Thu 14 Jan", or "Thu 14 Jan and Fri 15 Jan". */
export function listWords(dates: string[]): string {
  const words = dates.map(dayWords);
  if (words.length <= 1) return words.join("");
  return `${words.slice(0, -1).join(", ")} and ${words[words.length - 1]}`;
}

/** An ISO date `n` days on (wall-clock dates). */
export function plusDays(date: string, n: number): string {
  const d = new Date(`${date}T12:00:00Z`);
  d.setUTCDate(d.getUTCDate() + n);
  return d.toISOString().slice(0, 10);
}

/** A visit whose days the trade has not confirmed yet (TimelineVisit.settled false). */
export const unsettledWords = {
  badge: "To be confirmed",
  line: (v: Pick<TimelineVisit, "businessName">) =>
    `${v.businessName} has not confirmed these days yet, so they may still change.`,
};
