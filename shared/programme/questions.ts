// The questions the screens ask (spec "Questions the screens ask"): start window, first free
// start of a trade, and the impact of a proposed change.
import { prepare } from "./prepare";
import {
  compute,
  describeStart,
  STATE_STARTED,
  type Computed,
} from "./schedule";
import { formatLocal, MINUTES_PER_DAY, parseDateTime, parseDay } from "./time";
import type { ProgrammeInput } from "./types";

export interface StartWindow {
  task: string;
  earliestStart: string;
  latestStart: string;
  /** Every slot start from early start to late start; empty when late start is before early. */
  starts: string[];
  /** False when even the early start misses handover (negative float). */
  keepsHandover: boolean;
}

function taskIndex(c: Computed, taskId: string): number {
  const i = c.p.index.get(taskId);
  if (i === undefined)
    throw new Error(`Task "${taskId}" is not in this programme`);
  return i;
}

/** The starts from early to late start that keep handover (or the programme's finish). */
export function startWindow(
  input: ProgrammeInput,
  taskId: string,
): StartWindow {
  const c = compute(prepare(input));
  const i = taskIndex(c, taskId);
  const tb = c.p.tables[i];
  const starts: string[] = [];
  if (c.p.dur[i] === 0) {
    // A milestone may sit on any boundary in the window; list its slot starts plus both ends.
    if (c.ls[i] >= c.es[i]) {
      starts.push(formatLocal(c.es[i]));
      for (let k = tb.startsAtOrBefore(c.es[i]); tb.start(k) <= c.ls[i]; k++)
        starts.push(formatLocal(tb.start(k)));
      if (starts[starts.length - 1] !== formatLocal(c.ls[i]))
        starts.push(formatLocal(c.ls[i]));
    }
  } else {
    const last = tb.startsBefore(c.ls[i]);
    for (let k = tb.startsBefore(c.es[i]); k <= last; k++)
      starts.push(formatLocal(tb.start(k)));
  }
  return {
    task: taskId,
    earliestStart: formatLocal(c.es[i]),
    latestStart: formatLocal(c.ls[i]),
    starts,
    keepsHandover: c.ls[i] >= c.es[i],
  };
}

export interface FreeStart {
  task: string;
  resource: string;
  start: string;
  finish: string;
  lateStart: string;
  /** True when the first free start lies past the late start (handover would slip). */
  pastLateStart: boolean;
  message: string;
}

/** How far ahead first-free-start searches: two years of slots. */
const SEARCH_SLOTS = 2 * 2 * 366;

/** Internal: first free start of task i for `resource`, at or after `from`, on a computed schedule. */
export function firstFreeIn(
  c: Computed,
  i: number,
  resource: string,
  from: number,
): FreeStart | null {
  const { p } = c;
  const tb = p.tables[i];
  const d = p.dur[i];
  const k0 = tb.startsBefore(from);
  const kEnd = k0 + SEARCH_SLOTS;
  // Slot ranges the resource is not free: its other bookings, and its other tasks in this input.
  const blocked: [number, number][] = [];
  const block = (s: number, f: number) => {
    const a = tb.endsAtOrBefore(s); // first slot ending after s
    const b = tb.startsBefore(f) - 1; // last slot starting before f
    if (b >= a && b >= k0 && a <= kEnd) blocked.push([a, b]);
  };
  for (const b of p.busy) if (b.resource === resource) block(b.start, b.finish);
  for (let t = 0; t < p.n; t++) {
    if (t === i || p.resource[t] !== resource || p.dur[t] === 0) continue;
    block(c.ps[t], c.pf[t]);
  }
  blocked.sort((x, y) => x[0] - y[0]);
  let k = k0;
  let found = -1;
  if (d === 0) found = k0;
  else {
    // Walk the blocked ranges in order; a gap of d free slots is the answer.
    for (const [a, b] of blocked) {
      if (b < k) continue;
      if (a - k >= d) break;
      k = b + 1;
    }
    if (k <= kEnd) found = k;
  }
  if (found < 0) return null;
  const start = d === 0 ? Math.max(from, c.es[i]) : tb.start(found);
  const finish = d === 0 ? start : tb.end(found + d - 1);
  const past = start > c.ls[i];
  const who = resource.length
    ? resource[0].toUpperCase() + resource.slice(1)
    : resource;
  return {
    task: p.ids[i],
    resource,
    start: formatLocal(start),
    finish: formatLocal(finish),
    lateStart: formatLocal(c.ls[i]),
    pastLateStart: past,
    message: past
      ? `${who} is first free ${describeStart(start, tb)}, after the latest start that keeps handover (${describeStart(c.ls[i], tb)})`
      : `${who} is free from ${describeStart(start, tb)}`,
  };
}

/**
 * The earliest start at or after the task's early start (or `after`, if later) at which the
 * resource has `duration` consecutive free working slots; may lie past the late start.
 */
export function firstFreeStart(
  input: ProgrammeInput,
  taskId: string,
  options: { resource?: string; after?: string } = {},
): FreeStart | null {
  const c = compute(prepare(input));
  const i = taskIndex(c, taskId);
  const resource = options.resource ?? c.p.resource[i];
  if (!resource) throw new Error(`Task "${taskId}" has no resource; pass one`);
  let from = c.es[i];
  if (options.after) {
    const t =
      parseDateTime(options.after) ??
      (parseDay(options.after) ?? NaN) * MINUTES_PER_DAY;
    if (!Number.isNaN(t) && t > from) from = t;
  }
  return firstFreeIn(c, i, resource, from);
}

export interface TaskMove {
  task: string;
  fromStart: string;
  toStart: string;
  fromFinish: string;
  toFinish: string;
  /** Working days on the task's calendar; positive is later. */
  byDays: number;
}

export interface Reconfirm {
  task: string;
  bookedStart: string;
  /** The early start, or the trade's first free start after it. */
  proposedStart: string;
  reason: string;
}

export interface Impact {
  moves: TaskMove[];
  reconfirm: Reconfirm[];
  handover: {
    finishBefore: string | null;
    finishAfter: string | null;
    slipDaysBefore: number | null;
    slipDaysAfter: number | null;
    /** Working days the programme's finish moves, on the workshop calendar; positive is later. */
    changeDays: number;
  };
}

/** Schedule before and after a proposed edit: what moves, which bookings to re-confirm, handover. */
export function impactOf(
  before: ProgrammeInput,
  after: ProgrammeInput,
): Impact {
  const b = compute(prepare(before));
  const a = compute(prepare(after));
  const moves: TaskMove[] = [];
  const reconfirm: Reconfirm[] = [];
  for (let i = 0; i < a.p.n; i++) {
    const id = a.p.ids[i];
    const tb = a.p.tables[i];
    const j = b.p.index.get(id);
    if (j !== undefined && (b.ps[j] !== a.ps[i] || b.pf[j] !== a.pf[i])) {
      // Count the shift of the start, or of the finish when only the duration changed.
      const slots =
        b.ps[j] !== a.ps[i]
          ? tb.slotsBetween(b.ps[j], a.ps[i])
          : tb.slotsBetween(b.pf[j], a.pf[i]);
      moves.push({
        task: id,
        fromStart: formatLocal(b.ps[j]),
        toStart: formatLocal(a.ps[i]),
        fromFinish: formatLocal(b.pf[j]),
        toFinish: formatLocal(a.pf[i]),
        byDays: slots / 2 + 0,
      });
    }
    const pin = a.p.pin[i];
    if (Number.isNaN(pin) || a.state[i] >= STATE_STARTED) continue;
    if (a.es[i] > pin) {
      // The links now allow only a later start: propose the early start, or the trade's first
      // free start after it. Applying it is the server's job.
      const r = a.p.resource[i];
      const free = r ? firstFreeIn(a, i, r, a.es[i]) : null;
      reconfirm.push({
        task: id,
        bookedStart: formatLocal(pin),
        proposedStart: free ? free.start : formatLocal(a.es[i]),
        reason: `The work it waits for now allows a start only from ${describeStart(a.es[i], tb)}`,
      });
    } else if (j !== undefined && b.p.pin[j] !== pin) {
      reconfirm.push({
        task: id,
        bookedStart: Number.isNaN(b.p.pin[j])
          ? formatLocal(pin)
          : formatLocal(b.p.pin[j]),
        proposedStart: formatLocal(pin),
        reason: `The booking moves to ${describeStart(pin, tb)}`,
      });
    }
  }
  const fb = b.p.n ? b.finish : NaN;
  const fa = a.p.n ? a.finish : NaN;
  const change =
    Number.isNaN(fb) || Number.isNaN(fa)
      ? 0
      : a.p.workshop.slotsBetween(fb, fa);
  return {
    moves,
    reconfirm,
    handover: {
      finishBefore: Number.isNaN(fb) ? null : formatLocal(fb),
      finishAfter: Number.isNaN(fa) ? null : formatLocal(fa),
      slipDaysBefore:
        b.handoverSlipSlots === null ? null : b.handoverSlipSlots / 2,
      slipDaysAfter:
        a.handoverSlipSlots === null ? null : a.handoverSlipSlots / 2,
      changeDays: change / 2 + 0,
    },
  };
}
