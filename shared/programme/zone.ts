// Real-time conversion for elapsed-hour lags (spec: "a lag across a clock change is that many
// real hours"; references §4). Luxon knows the IANA rules; calling it per link would dominate the
// run time, so each zone's offset transitions are found once (sampled daily, then bisected to the
// minute) and looked up by binary search afterwards.
import { DateTime, IANAZone } from "luxon";
import { MINUTES_PER_DAY } from "./time";

/** True when `zone` is a known IANA time-zone name. */
export function isValidZone(zone: string): boolean {
  // Luxon builds an Intl formatter to answer; remember the answer.
  let ok = validity.get(zone);
  if (ok === undefined) {
    ok = IANAZone.isValidZone(zone);
    validity.set(zone, ok);
  }
  return ok;
}

const validity = new Map<string, boolean>();

interface ZoneTable {
  fromUtcMin: number; // covered range, UTC minutes
  toUtcMin: number;
  /** Transition instants (UTC minutes), ascending; offsets[i] applies from at[i]. */
  at: number[];
  offsets: number[];
}

const tables = new Map<string, ZoneTable>();

function offsetAt(zone: string, utcMin: number): number {
  return DateTime.fromMillis(utcMin * 60000, { zone }).offset;
}

function build(zone: string, fromUtc: number, toUtc: number): ZoneTable {
  const at: number[] = [fromUtc];
  const offsets: number[] = [offsetAt(zone, fromUtc)];
  let prevT = fromUtc;
  let prevOff = offsets[0];
  for (
    let t = fromUtc + MINUTES_PER_DAY;
    t <= toUtc + MINUTES_PER_DAY;
    t += MINUTES_PER_DAY
  ) {
    const off = offsetAt(zone, t);
    if (off !== prevOff) {
      // Bisect to the first minute with the new offset.
      let lo = prevT;
      let hi = t;
      while (hi - lo > 1) {
        const mid = Math.floor((lo + hi) / 2);
        if (offsetAt(zone, mid) === prevOff) lo = mid;
        else hi = mid;
      }
      at.push(hi);
      offsets.push(off);
      prevOff = off;
    }
    prevT = t;
  }
  return {
    fromUtcMin: fromUtc,
    toUtcMin: toUtc + MINUTES_PER_DAY,
    at,
    offsets,
  };
}

function table(zone: string, utcMin: number): ZoneTable {
  let tb = tables.get(zone);
  if (!tb || utcMin < tb.fromUtcMin || utcMin > tb.toUtcMin) {
    // Cover ten years around the instant asked for, widening any table already built.
    const span = 3653 * MINUTES_PER_DAY;
    const from = Math.min(tb ? tb.fromUtcMin : Infinity, utcMin - span);
    const to = Math.max(tb ? tb.toUtcMin : -Infinity, utcMin + span);
    tb = build(zone, from, to);
    tables.set(zone, tb);
  }
  return tb;
}

/** UTC offset in minutes in force at a UTC instant (minutes since the epoch). */
export function zoneOffset(zone: string, utcMin: number): number {
  const tb = table(zone, utcMin);
  const at = tb.at;
  let lo = 0;
  let hi = at.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (at[mid] <= utcMin) lo = mid;
    else hi = mid - 1;
  }
  return tb.offsets[lo];
}

/**
 * UTC minutes of a local wall-clock instant. A wall-clock time inside a spring-forward gap (never
 * a working time in the UK) resolves an hour early; every other time converts exactly.
 */
export function localToUtc(zone: string, local: number): number {
  const o1 = zoneOffset(zone, local - zoneOffset(zone, local));
  const utc = local - o1;
  const o2 = zoneOffset(zone, utc);
  return o2 === o1 ? utc : local - o2;
}

/** Local wall-clock minutes of a UTC instant. */
export function utcToLocal(zone: string, utcMin: number): number {
  return utcMin + zoneOffset(zone, utcMin);
}

/** A local instant plus real elapsed hours (may be negative), as a local instant. */
export function addElapsedMinutes(
  zone: string,
  local: number,
  minutes: number,
): number {
  return utcToLocal(zone, localToUtc(zone, local) + minutes);
}
