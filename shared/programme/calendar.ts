// Working calendars and their slot tables (spec "Time model").
//
// Every working day has exactly two slots: morning (day start → 12:00) and afternoon
// (12:00 → day end). A slot table lists the working days of a calendar in order, so slot k is
// day workDays[k >> 1], morning when k is even. Positions are counted in slots; "add N working
// days" is `position + 2N`, and turning an instant into a position is a lookup in `cum`
// (slots before each day), so no operation loops over dates.
import { bankHolidayDays } from "./holidays";
import type { CalendarInput, HolidayRegion } from "./types";
import { parseDay, parseTime } from "./time";

// Local copies: module-level imports of constants cost a binding lookup in the hot path.
const MINUTES_PER_DAY = 1440;
const NOON = 720;

export const DEFAULT_WEEKDAYS = [1, 2, 3, 4, 5];
export const DEFAULT_DAY_START = "08:00";
export const DEFAULT_DAY_END = "16:30";

/** One input calendar with its defaults applied. */
export interface CalendarDef {
  id: string;
  weekdays: number[];
  dayStart: number;
  dayEnd: number;
  region: HolidayRegion | null;
  daysOff: number[];
}

/** Apply the contract's defaults (Mon–Fri, 08:00–16:30, no region, no days off). */
export function resolveCalendar(c: CalendarInput): CalendarDef {
  return {
    id: c.id,
    weekdays: [...new Set(c.workingWeekdays ?? DEFAULT_WEEKDAYS)].sort(),
    dayStart: parseTime(c.dayStart ?? DEFAULT_DAY_START) ?? 480,
    dayEnd: parseTime(c.dayEnd ?? DEFAULT_DAY_END) ?? 990,
    region: c.holidayRegion ?? null,
    daysOff: [
      ...new Set(
        (c.daysOff ?? []).map((d) => parseDay(d)).filter((d) => d !== null),
      ),
    ].sort((a, b) => a - b),
  };
}

const CHUNK_DAYS = 366;

/**
 * The slot table of one calendar or of the intersection of several (spec: a list of calendars
 * intersects their days, and their hours: latest day start, earliest day end).
 */
export class SlotTable {
  readonly ids: string[];
  readonly dayStart: number;
  readonly dayEnd: number;
  /** First day covered; instants before it are clamped to it (far before any input date). */
  readonly baseDay: number;
  private endDay: number; // exclusive
  private readonly members: CalendarDef[];
  private readonly weekdayOk: boolean[];
  private readonly offDays = new Set<number>();
  private readonly offYears = new Set<number>();
  /** Working days in order. */
  private workDays: number[] = [];
  /** cum[d - baseDay] = number of slots on days before d; length = covered days + 1. */
  private cum: number[] = [0];

  constructor(members: CalendarDef[], baseDay: number) {
    this.members = members;
    this.ids = members.map((m) => m.id);
    this.dayStart = Math.max(...members.map((m) => m.dayStart));
    this.dayEnd = Math.min(...members.map((m) => m.dayEnd));
    this.weekdayOk = [false];
    for (let wd = 1; wd <= 7; wd++)
      this.weekdayOk.push(members.every((m) => m.weekdays.includes(wd)));
    for (const m of members) for (const d of m.daysOff) this.offDays.add(d);
    this.baseDay = baseDay;
    this.endDay = baseDay;
    this.extendTo(baseDay + 3 * CHUNK_DAYS);
  }

  private addHolidayYear(year: number): void {
    if (this.offYears.has(year)) return;
    this.offYears.add(year);
    for (const m of this.members) {
      if (m.region)
        for (const d of bankHolidayDays(m.region, year)) this.offDays.add(d);
    }
  }

  private extendTo(day: number): void {
    if (day < this.endDay) return;
    const target = Math.max(day + 1, this.endDay + CHUNK_DAYS);
    let count = this.cum[this.cum.length - 1];
    for (let d = this.endDay; d < target; d++) {
      const date = new Date(d * 86400000);
      if (date.getUTCMonth() === 0 && date.getUTCDate() === 1)
        this.addHolidayYear(date.getUTCFullYear());
      if (d === this.endDay) this.addHolidayYear(date.getUTCFullYear());
      if (this.isWorkingDayRaw(d)) {
        this.workDays.push(d);
        count += 2;
      }
      this.cum.push(count);
    }
    this.endDay = target;
  }

  private isWorkingDayRaw(d: number): boolean {
    // 1970-01-01 (day 0) was a Thursday, ISO weekday 4.
    const wd = ((((d + 3) % 7) + 7) % 7) + 1;
    return this.weekdayOk[wd] && !this.offDays.has(d);
  }

  /** True when `day` is a working day of this calendar. */
  isWorkingDay(day: number): boolean {
    if (day < this.baseDay) return this.isWorkingDayRaw(day);
    if (day >= this.endDay) this.extendTo(day);
    return this.cum[day - this.baseDay + 1] > this.cum[day - this.baseDay];
  }

  /** Number of slots on days before `day`. */
  private slotsBeforeDay(day: number): number {
    if (day <= this.baseDay) return 0;
    if (day >= this.endDay) this.extendTo(day);
    return this.cum[day - this.baseDay];
  }

  private ensureSlot(k: number): void {
    while (k >= this.workDays.length * 2)
      this.extendTo(this.endDay + CHUNK_DAYS);
  }

  /** Start instant (local minutes) of slot k. */
  start(k: number): number {
    if (k < 0) k = 0;
    this.ensureSlot(k);
    return (
      this.workDays[k >> 1] * MINUTES_PER_DAY + (k & 1 ? NOON : this.dayStart)
    );
  }

  /** End instant of slot k. */
  end(k: number): number {
    if (k < 0) k = 0;
    this.ensureSlot(k);
    return (
      this.workDays[k >> 1] * MINUTES_PER_DAY + (k & 1 ? this.dayEnd : NOON)
    );
  }

  /** Number of slots starting before t: the position t snaps forward to (first start ≥ t). */
  startsBefore(t: number): number {
    const d = Math.floor(t / MINUTES_PER_DAY);
    let k = this.slotsBeforeDay(d);
    if (d >= this.baseDay && this.cum[d - this.baseDay + 1] > k) {
      const m = t - d * MINUTES_PER_DAY;
      if (m > this.dayStart) k++;
      if (m > NOON) k++;
    }
    return k;
  }

  /** Number of slots starting at or before t. */
  startsAtOrBefore(t: number): number {
    const d = Math.floor(t / MINUTES_PER_DAY);
    let k = this.slotsBeforeDay(d);
    if (d >= this.baseDay && this.cum[d - this.baseDay + 1] > k) {
      const m = t - d * MINUTES_PER_DAY;
      if (m >= this.dayStart) k++;
      if (m >= NOON) k++;
    }
    return k;
  }

  /** Number of slots ending at or before t (q: the finish boundary "end of slot q − 1"). */
  endsAtOrBefore(t: number): number {
    const d = Math.floor(t / MINUTES_PER_DAY);
    let k = this.slotsBeforeDay(d);
    if (d >= this.baseDay && this.cum[d - this.baseDay + 1] > k) {
      const m = t - d * MINUTES_PER_DAY;
      if (m >= NOON) k++;
      if (m >= this.dayEnd) k++;
    }
    return k;
  }

  /** Number of slots ending before t. */
  endsBefore(t: number): number {
    const d = Math.floor(t / MINUTES_PER_DAY);
    let k = this.slotsBeforeDay(d);
    if (d >= this.baseDay && this.cum[d - this.baseDay + 1] > k) {
      const m = t - d * MINUTES_PER_DAY;
      if (m > NOON) k++;
      if (m > this.dayEnd) k++;
    }
    return k;
  }

  /** Earliest slot boundary (a start or an end) at or after t. */
  boundaryAtOrAfter(t: number): number {
    const s = this.start(this.startsBefore(t));
    const q = this.endsBefore(t);
    const e = this.end(q);
    return s < e ? s : e;
  }

  /** Latest slot boundary at or before t. */
  boundaryAtOrBefore(t: number): number {
    const j = this.startsAtOrBefore(t);
    const q = this.endsAtOrBefore(t);
    const s = j > 0 ? this.start(j - 1) : -Infinity;
    const e = q > 0 ? this.end(q - 1) : -Infinity;
    const best = s > e ? s : e;
    return best === -Infinity ? this.start(0) : best;
  }

  /** True when t is a slot start or end of this calendar. */
  isBoundary(t: number): boolean {
    return (
      this.startsAtOrBefore(t) !== this.startsBefore(t) ||
      this.endsAtOrBefore(t) !== this.endsBefore(t)
    );
  }

  /** Whole slots inside [a, b]; negative (slots inside [b, a]) when b < a. */
  slotsBetween(a: number, b: number): number {
    if (a <= b)
      return Math.max(0, this.endsAtOrBefore(b) - this.startsBefore(a));
    return -Math.max(0, this.endsAtOrBefore(a) - this.startsBefore(b));
  }
}

const tableCache = new Map<string, SlotTable>();

/** The (cached) slot table for a set of calendars from `baseDay`; tables are built once. */
export function slotTableFor(
  members: CalendarDef[],
  baseDay: number,
): SlotTable {
  const sorted = [...members].sort((a, b) =>
    a.id < b.id ? -1 : a.id > b.id ? 1 : 0,
  );
  const key = baseDay + "|" + JSON.stringify(sorted);
  let tb = tableCache.get(key);
  if (!tb) {
    if (tableCache.size > 256) tableCache.clear();
    tb = new SlotTable(sorted, baseDay);
    tableCache.set(key, tb);
  }
  return tb;
}

/** Whether `date` ("YYYY-MM-DD") is a working day of the intersection of `calendars`. */
export function isWorkingDay(
  calendars: CalendarInput | CalendarInput[],
  date: string,
): boolean {
  const day = parseDay(date);
  if (day === null) throw new Error(`"${date}" is not a date (YYYY-MM-DD)`);
  const list = Array.isArray(calendars) ? calendars : [calendars];
  return slotTableFor(
    list.map(resolveCalendar),
    Math.floor((day - 800) / 512) * 512,
  ).isWorkingDay(day);
}

/** The working days ("YYYY-MM-DD") from `from` to `to` inclusive, on the intersection of `calendars`. */
export function workingDaysBetween(
  calendars: CalendarInput | CalendarInput[],
  from: string,
  to: string,
): string[] {
  const a = parseDay(from);
  const b = parseDay(to);
  if (a === null || b === null)
    throw new Error("from and to must be dates (YYYY-MM-DD)");
  const list = Array.isArray(calendars) ? calendars : [calendars];
  const tb = slotTableFor(
    list.map(resolveCalendar),
    Math.floor((a - 800) / 512) * 512,
  );
  const out: string[] = [];
  for (let d = a; d <= b; d++)
    if (tb.isWorkingDay(d))
      out.push(new Date(d * 86400000).toISOString().slice(0, 10));
  return out;
}
