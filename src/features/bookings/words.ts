// Booking dates, arrival windows and history in words (brief, "Words" and "Look and feel":
// dates with the weekday, times on the 24-hour clock).
import { aParty, partyNoun } from "../../../shared/words/trades";
import type {
  BookingChannel,
  BookingResponse,
  LinkPageResponse,
  Party,
} from "../../../shared/schemas";
import { formatDateShort } from "../../lib/format";

type Arrival = Pick<
  BookingResponse,
  "arrivalWindow" | "arrivalFrom" | "arrivalTo"
>;

/** The date part of a local instant ("2026-03-05T12:00" → "2026-03-05"). */
export const dateOf = (instant: string) => instant.slice(0, 10);
const timeOf = (instant: string) =>
  instant.length > 10 ? instant.slice(11, 16) : null;

/** "Thu 5 Mar" (the year only outside this year). */
export const dayWords = (instant: string) => formatDateShort(dateOf(instant));

/** Which half of the day a local start falls in: from midday it is the afternoon. */
export function halfOf(instant: string): "morning" | "afternoon" {
  const t = timeOf(instant);
  return t && t >= "12:00" ? "afternoon" : "morning";
}

/** "Thu 5 Mar morning" / "Thu 5 Mar afternoon": a start as the engine gives it. */
export function startWords(instant: string): string {
  return `${dayWords(instant)} ${halfOf(instant)}`;
}

/** "morning", "afternoon", "all day", "08:00–09:00". */
export function arrivalWords(b: Arrival): string {
  switch (b.arrivalWindow) {
    case "morning":
      return "morning";
    case "afternoon":
      return "afternoon";
    case "all-day":
      return "all day";
    case "range":
      return b.arrivalFrom && b.arrivalTo
        ? `${b.arrivalFrom}–${b.arrivalTo}`
        : "time to be agreed";
  }
}

/** The days of a booking: "Thu 5 Mar", or "Thu 5 Mar – Fri 6 Mar". */
export function daysWords(start: string, finish: string): string {
  const a = dateOf(start);
  const b = dateOf(finish);
  return a === b || !finish ? dayWords(a) : `${dayWords(a)} – ${dayWords(b)}`;
}

/** "Thu 5 Mar, morning", "Thu 5 Mar – Fri 6 Mar, all day", "Thu 5 Mar, 08:00–09:00". */
export function visitWords(
  b: Arrival & Pick<LinkPageResponse, "start" | "finish">,
): string {
  return `${daysWords(b.start, b.finish)}, ${arrivalWords(b)}`;
}

/** How a change came: the history's "how". */
export const channelWords: Record<BookingChannel, string> = {
  app: "in Sitecue",
  link: "by link",
  phone: "by phone",
  text: "by text message",
  "calendar-reply": "from their calendar app",
  system: "by Sitecue",
};

/** "Thu 5 Mar, 14:05" for history timestamps (local time of the browser). */
export function whenWords(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  const local = `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, "0")}-${String(d.getDate()).padStart(2, "0")}`;
  const hh = String(d.getHours()).padStart(2, "0");
  const mm = String(d.getMinutes()).padStart(2, "0");
  return `${formatDateShort(local)}, ${hh}:${mm}`;
}

/** An ISO date `n` days after `date` (calendar days, no time zone drift). */
export function addDays(date: string, n: number): string {
  const d = new Date(`${date}T12:00:00Z`);
  d.setUTCDate(d.getUTCDate() + n);
  return d.toISOString().slice(0, 10);
}

/** ISO weekday of a date, 1 = Monday … 7 = Sunday. */
export function isoWeekday(date: string): number {
  const w = new Date(`${date}T12:00:00Z`).getUTCDay();
  return w === 0 ? 7 : w;
}

/** Today's date in the browser, YYYY-MM-DD. */
export function todayLocal(): string {
  const d = new Date();
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, "0")}-${String(d.getDate()).padStart(2, "0")}`;
}

/** The trade a task needs, as a noun: "plasterer", "flooring fitter" (the shared trade words). */
export const kindNoun = (party: Party) => partyNoun(party);

/** With its article: "a plasterer", "an electrician". */
export const aKind = (party: Party) => aParty(party);

/**
 * What a start window keeps: the agreed handover, or — with none agreed yet — the programme's
 * planned finish (the engine then reads its own early finish as the target).
 */
export const keptWords = (handoverDate: string | null) =>
  handoverDate ? "handover" : "the planned finish";
