// Dates always carry the weekday and times use the 24-hour clock (product brief,
// "Look and feel"). en-GB gives day-month order; the comma Intl adds is dropped.

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** Parse "YYYY-MM-DD" as a local calendar date (not UTC midnight), or a full ISO timestamp. */
export function parseDate(value: string): Date | null {
  const m = ISO_DATE.exec(value);
  const d = m
    ? new Date(Number(m[1]), Number(m[2]) - 1, Number(m[3]))
    : new Date(value);
  return Number.isNaN(d.getTime()) ? null : d;
}

function parts(
  d: Date,
  options: Intl.DateTimeFormatOptions,
): Record<string, string> {
  const out: Record<string, string> = {};
  for (const p of new Intl.DateTimeFormat("en-GB", options).formatToParts(d)) {
    if (p.type !== "literal") out[p.type] = p.value;
  }
  return out;
}

/** "Thu 14 Jan 2026"; without the year when `withYear` is false ("Thu 14 Jan"). */
export function formatDate(
  value: string | null | undefined,
  withYear = true,
): string {
  if (!value) return "—";
  const d = parseDate(value);
  if (!d) return value;
  const p = parts(d, {
    weekday: "short",
    day: "numeric",
    month: "short",
    year: "numeric",
  });
  return withYear
    ? `${p.weekday} ${p.day} ${p.month} ${p.year}`
    : `${p.weekday} ${p.day} ${p.month}`;
}

/** The year is left out for dates in the current year, where it only adds noise. */
export function formatDateShort(value: string | null | undefined): string {
  if (!value) return "—";
  const d = parseDate(value);
  if (!d) return value;
  return formatDate(value, d.getFullYear() !== new Date().getFullYear());
}

/** "14:05", 24-hour clock. */
export function formatTime(value: string): string {
  const d = parseDate(value);
  if (!d) return value;
  const p = parts(d, { hour: "2-digit", minute: "2-digit", hourCycle: "h23" });
  return `${p.hour}:${p.minute}`;
}

/** "Thu 14 Jan 2026, 14:05" for timestamps. */
export function formatDateTime(value: string): string {
  const d = parseDate(value);
  if (!d) return value;
  return `${formatDate(value)}, ${formatTime(value)}`;
}

/** A date range: "Thu 14 Jan – Fri 15 Jan 2026", or one date when start and finish agree. */
export function formatDateRange(start: string, finish: string): string {
  // Bookings carry wall-clock times ("2026-11-27T08:00"); the range is about days.
  if (!finish || start.slice(0, 10) === finish.slice(0, 10))
    return formatDate(start);
  const a = parseDate(start);
  const b = parseDate(finish);
  if (!a || !b) return `${start} – ${finish}`;
  const sameYear = a.getFullYear() === b.getFullYear();
  return `${formatDate(start, !sameYear)} – ${formatDate(finish)}`;
}

/** "1 day", "2.5 days"; a zero-length task is a milestone (e.g. handover). */
export function formatDays(days: number): string {
  if (days === 0) return "milestone";
  const n = Number.isInteger(days)
    ? String(days)
    : days.toFixed(1).replace(/\.0$/, "");
  return `${n} ${days === 1 ? "day" : "days"}`;
}

const WEEKDAY_NAMES = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"];

/** ISO weekday (1 = Monday) to its short name. */
export function weekdayName(isoWeekday: number): string {
  return WEEKDAY_NAMES[isoWeekday - 1] ?? String(isoWeekday);
}

/** [1,2,3,4,5] → "Mon–Fri"; otherwise a list ("Mon, Wed, Sat"). */
export function formatWeekdays(days: readonly number[]): string {
  const sorted = [...days].sort((a, b) => a - b);
  if (sorted.length === 0) return "None";
  const contiguous = sorted.every((d, i) => i === 0 || d === sorted[i - 1] + 1);
  if (contiguous && sorted.length >= 3) {
    return `${weekdayName(sorted[0])}–${weekdayName(sorted[sorted.length - 1])}`;
  }
  return sorted.map(weekdayName).join(", ");
}
