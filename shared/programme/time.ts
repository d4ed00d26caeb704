// Local wall-clock arithmetic. The engine measures every instant in "local minutes": minutes
// since 1970-01-01 00:00 *wall clock* in the job's time zone, as if that zone never changed
// offset. Slots are defined in wall-clock time, so DST never shifts a slot (spec "Time model");
// only elapsed-hour lags need real time, and go through zone.ts.

export const MINUTES_PER_DAY = 1440;
export const NOON = 720;

const TIME_RE = /^(\d{2}):(\d{2})$/;

// Hand-written digit parsing: dates are parsed for every task of a 10,000-task portfolio.
function digits(s: string, from: number, count: number): number {
  let v = 0;
  for (let i = from; i < from + count; i++) {
    const c = s.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return -1;
    v = v * 10 + c;
  }
  return v;
}

function datePart(s: string): number | null {
  if (s.charCodeAt(4) !== 45 || s.charCodeAt(7) !== 45) return null; // '-'
  const y = digits(s, 0, 4);
  const mo = digits(s, 5, 2);
  const d = digits(s, 8, 2);
  if (y < 0 || mo < 0 || d < 0) return null;
  return dayFromParts(y, mo, d);
}

/** Day number (days since 1970-01-01) of a valid "YYYY-MM-DD", or null. */
export function parseDay(s: string): number | null {
  if (typeof s !== "string" || s.length !== 10) return null;
  return datePart(s);
}

const MONTH_DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

function dayFromParts(y: number, mo: number, d: number): number | null {
  if (mo < 1 || mo > 12 || d < 1) return null;
  const leap = (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
  // Reject 2026-02-30 and the like, which Date.UTC would silently roll over.
  if (d > (mo === 2 && leap ? 29 : MONTH_DAYS[mo - 1])) return null;
  // Days from civil (H. Hinnant's algorithm): no Date objects on the hot path.
  const yy = mo <= 2 ? y - 1 : y;
  const era = Math.floor(yy / 400);
  const yoe = yy - era * 400;
  const doy = Math.floor((153 * (mo + (mo > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
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
  if (
    typeof s !== "string" ||
    s.length !== 16 ||
    s.charCodeAt(10) !== 84 ||
    s.charCodeAt(13) !== 58
  )
    return null; // 'T', ':'
  const day = datePart(s);
  const h = digits(s, 11, 2);
  const min = digits(s, 14, 2);
  if (day === null || h < 0 || min < 0 || h > 23 || min > 59) return null;
  return day * MINUTES_PER_DAY + h * 60 + min;
}

/** True when the string is a date only ("YYYY-MM-DD"). */
export function isDateOnly(s: string): boolean {
  return parseDay(s) !== null;
}

/**
 * Local minutes of a date or date-time: a date alone means `dateMinute` minutes into that day
 * (e.g. 0 for its start, 1440 for its end). NaN when neither form parses.
 */
export function parseDateOrDateTime(s: string, dateMinute: number): number {
  if (typeof s !== "string") return NaN;
  if (s.length === 10) {
    const d = datePart(s);
    return d === null ? NaN : d * MINUTES_PER_DAY + dateMinute;
  }
  const t = parseDateTime(s);
  return t === null ? NaN : t;
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
  return (h < 10 ? "0" : "") + h + ":" + (m < 10 ? "0" : "") + m;
}

// "YYYY-MM-DDT" per day, cached in an array (1990–2089) so that a 10,000-task result does not
// format 60,000 dates from scratch.
const CACHE_FROM = 7305; // 1990-01-01
const CACHE_DAYS = 36525;
const dayStrings: (string | undefined)[] = new Array(CACHE_DAYS);
const timeStrings: string[] = [];
for (let i = 0; i < MINUTES_PER_DAY; i++) timeStrings.push(formatTime(i));

/** "YYYY-MM-DDTHH:mm" of local minutes (the contract's offset-free local date-time). */
export function formatLocal(t: number): string {
  const day = Math.floor(t / MINUTES_PER_DAY);
  const k = day - CACHE_FROM;
  let ds = k >= 0 && k < CACHE_DAYS ? dayStrings[k] : undefined;
  if (ds === undefined) {
    ds = formatDay(day) + "T";
    if (k >= 0 && k < CACHE_DAYS) dayStrings[k] = ds;
  }
  return ds + timeStrings[t - day * MINUTES_PER_DAY];
}

const WEEKDAYS = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"];
const MONTHS = [
  "Jan",
  "Feb",
  "Mar",
  "Apr",
  "May",
  "Jun",
  "Jul",
  "Aug",
  "Sep",
  "Oct",
  "Nov",
  "Dec",
];

/** A day written the Sitecue way, with its weekday: "Thu 5 Mar" (product brief, Look and feel). */
export function humanDay(day: number): string {
  const k = day - CACHE_FROM;
  const cached = k >= 0 && k < CACHE_DAYS ? humanDays[k] : undefined;
  if (cached !== undefined) return cached;
  const d = new Date(day * 86400000);
  const s = `${WEEKDAYS[isoWeekday(day) - 1]} ${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]}`;
  if (k >= 0 && k < CACHE_DAYS) humanDays[k] = s;
  return s;
}

const humanDays: (string | undefined)[] = new Array(CACHE_DAYS);
