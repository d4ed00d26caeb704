// Local wall-clock arithmetic. The engine measures every instant in "local minutes": minutes
// since 1970-01-01 00:00 *wall clock* in the job's time zone, as if that zone never changed
// offset. Slots are defined in wall-clock time, so DST never shifts a slot (spec "Time model");
// only elapsed-hour lags need real time, and go through zone.ts.

export const MINUTES_PER_DAY = 1440;
export const NOON = 720;

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;
const DATE_TIME_RE = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/;
const TIME_RE = /^(\d{2}):(\d{2})$/;

/** Day number (days since 1970-01-01) of a valid "YYYY-MM-DD", or null. */
export function parseDay(s: string): number | null {
  const m = DATE_RE.exec(s);
  if (!m) return null;
  return dayFromParts(+m[1], +m[2], +m[3]);
}

function dayFromParts(y: number, mo: number, d: number): number | null {
  if (mo < 1 || mo > 12 || d < 1 || d > 31) return null;
  const ms = Date.UTC(y, mo - 1, d);
  const check = new Date(ms);
  // Reject 2026-02-30 and the like, which Date.UTC silently rolls over.
  if (check.getUTCFullYear() !== y || check.getUTCMonth() !== mo - 1 || check.getUTCDate() !== d)
    return null;
  return Math.round(ms / 86400000);
}

/** Minutes after midnight of a valid "HH:mm" (00:00–24:00), or null. */
export function parseTime(s: string): number | null {
  const m = TIME_RE.exec(s);
  if (!m) return null;
  const h = +m[1];
  const min = +m[2];
  if (min > 59 || h > 24 || (h === 24 && min !== 0)) return null;
  return h * 60 + min;
}

/** Local minutes of a valid "YYYY-MM-DDTHH:mm", or null. */
export function parseDateTime(s: string): number | null {
  const m = DATE_TIME_RE.exec(s);
  if (!m) return null;
  const day = dayFromParts(+m[1], +m[2], +m[3]);
  const h = +m[4];
  const min = +m[5];
  if (day === null || h > 23 || min > 59) return null;
  return day * MINUTES_PER_DAY + h * 60 + min;
}

/** True when the string is a date only ("YYYY-MM-DD"). */
export function isDateOnly(s: string): boolean {
  return DATE_RE.test(s);
}

/** ISO weekday (1 = Monday … 7 = Sunday) of a day number; 1970-01-01 was a Thursday. */
export function isoWeekday(day: number): number {
  return ((((day + 3) % 7) + 7) % 7) + 1;
}

/** "YYYY-MM-DD" of a day number. */
export function formatDay(day: number): string {
  return new Date(day * 86400000).toISOString().slice(0, 10);
}

/** "HH:mm" of minutes after midnight. */
export function formatTime(minuteOfDay: number): string {
  const h = Math.floor(minuteOfDay / 60);
  const m = minuteOfDay % 60;
  return (h < 10 ? '0' : '') + h + ':' + (m < 10 ? '0' : '') + m;
}

const dayStringCache = new Map<number, string>();
const timeStrings: string[] = [];
for (let i = 0; i < MINUTES_PER_DAY; i++) timeStrings.push(formatTime(i));

/** "YYYY-MM-DDTHH:mm" of local minutes (the contract's offset-free local date-time). */
export function formatLocal(t: number): string {
  const day = Math.floor(t / MINUTES_PER_DAY);
  let ds = dayStringCache.get(day);
  if (ds === undefined) {
    ds = formatDay(day) + 'T';
    if (dayStringCache.size > 20000) dayStringCache.clear();
    dayStringCache.set(day, ds);
  }
  return ds + timeStrings[t - day * MINUTES_PER_DAY];
}

const WEEKDAYS = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** A day written the Sitecue way, with its weekday: "Thu 5 Mar" (product brief, Look and feel). */
export function humanDay(day: number): string {
  const d = new Date(day * 86400000);
  return `${WEEKDAYS[isoWeekday(day) - 1]} ${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]}`;
}
