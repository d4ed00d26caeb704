// scheduleProgramme: forward pass, backward pass, float, readiness, problems and the driving
// path (spec "Scheduling rules" and "Conventions"). Each link rule is written out beside the
// code that applies it, forward in `linkStartBound`, backward in `linkLatestSource`.
import type { SlotTable } from "./calendar";
import { prepare, type Prepared } from "./prepare";
import { formatLocal, humanDay, formatTime } from "./time";

// Local copies of shared constants (see prepare.ts for KIND_* and UNIT_*), kept here because the
// passes read them millions of times.
const MINUTES_PER_DAY = 1440;
const NOON = 720;
const KIND_SS = 1;
const KIND_FF = 2;
const UNIT_ELAPSED = 1;
import type {
  Problem,
  ProgrammeInput,
  ProgrammeResult,
  TaskResult,
  WaitingOn,
} from "./types";
import { addElapsedMinutes } from "./zone";

export const STATE_WAITING = 0;
export const STATE_CLEAR = 1;
export const STATE_STARTED = 2;
export const STATE_DONE = 3;

/** The schedule as flat arrays (instants in local minutes), for the question helpers. */
export interface Computed {
  p: Prepared;
  es: Float64Array;
  ef: Float64Array;
  ls: Float64Array;
  lf: Float64Array;
  ps: Float64Array;
  pf: Float64Array;
  /** Total and free float in slots (half days). */
  tf: Int32Array;
  ff: Int32Array;
  state: Uint8Array;
  /** Per link: the start it allows its successor (NaN when the successor had started). */
  allows: Float64Array;
  /** Per task: the first slot start on or after the data date. */
  ddStart: Float64Array;
  finish: number;
  /** Handover as an instant: the end of the handover date; NaN without a handover. */
  handoverEnd: number;
  handoverSlipSlots: number | null;
  criticalPath: number[];
}

/**
 * The latest start position (non-milestone) or instant (milestone) that a link allows its
 * successor j, given the predecessor's planned start `srcStart` and finish `srcFinish`.
 *
 * Rules (spec "Links"):
 * - FS: j starts no earlier than predecessor finish + lag; SS: than predecessor start + lag;
 *   FF: j finishes no earlier than predecessor finish + lag.
 * - workingDays lag: snap the predecessor's instant forward to the next slot boundary of j's
 *   calendar, then count lag × 2 slots. Snapping is `startsBefore(src)`: the number of slots
 *   starting before src is the index of the boundary at or after it (a finish at 12:00 gives
 *   the afternoon slot; a finish at day end, the next working morning; a Saturday, Monday).
 * - elapsedHours lag: add real hours (across a clock change that is real time, references §4),
 *   then take the first slot of j starting at or after that instant; for FF, the first end of
 *   one of j's slots at or after it.
 * Returns a start position for a non-milestone, an instant for a milestone.
 */
function linkStartBound(
  p: Prepared,
  e: number,
  tb: SlotTable,
  n: number,
  srcStart: number,
  srcFinish: number,
): number {
  const kind = p.eKind[e];
  const src = kind === KIND_SS ? srcStart : srcFinish;
  const lag = p.eLag[e];
  if (p.eUnit[e] === UNIT_ELAPSED) {
    const t = lag === 0 ? src : addElapsedMinutes(p.zone, src, lag);
    // A milestone sits on the first boundary at or after the instant.
    if (n === 0) return tb.boundaryAtOrAfter(t);
    // FF: finish at the first slot end ≥ t, i.e. after endsBefore(t) slots; start n slots earlier.
    return kind === KIND_FF ? tb.endsBefore(t) + 1 - n : tb.startsBefore(t);
  }
  const b = tb.startsBefore(src) + lag;
  if (n === 0) {
    // A milestone sits at the earliest instant its links allow (Fri 16:30, not Mon 08:00): with
    // no lag that is the first boundary at or after src; otherwise the end of the slot before
    // the counted boundary. For a milestone start and finish coincide, so FF = FS.
    return lag === 0 ? tb.boundaryAtOrAfter(src) : tb.end(b - 1);
  }
  // FF: the finish boundary is b, so the start is n slots before it.
  return kind === KIND_FF ? b - n : b;
}

/**
 * The backward mirror of `linkStartBound`: the latest instant the predecessor's start (SS) or
 * finish (FS, FF) may have so that successor j can still start at `jStart` / finish at
 * `jFinish`. It is the exact inverse of the forward rule, so early ≤ late whenever handover
 * allows, and slack across an elapsed link is found in real time (spec "Conventions").
 */
function linkLatestSource(
  p: Prepared,
  e: number,
  j: number,
  jStart: number,
  jFinish: number,
): number {
  const kind = p.eKind[e];
  const lag = p.eLag[e];
  const tbj = p.tables[p.eTo[e]];
  const isMs = p.dur[j] === 0;
  if (p.eUnit[e] === UNIT_ELAPSED) {
    // start(first slot ≥ src + h) ≤ jStart ⇔ src + h ≤ jStart (real time); FF likewise on finish.
    const x = kind === KIND_FF ? jFinish : jStart;
    return lag === 0 ? x : addElapsedMinutes(p.zone, x, -lag);
  }
  // Forward: boundary index startsBefore(src) + lag ≤ the boundary index of j's date, which is
  // endsAtOrBefore(x) (the slots wholly before x). startsBefore(src) ≤ k ⇔ src ≤ start(k).
  const x = kind === KIND_FF && !isMs ? jFinish : jStart;
  if (isMs && lag === 0) return x;
  return tbj.start(tbj.endsAtOrBefore(x) - lag);
}

/** Internal: the whole schedule as arrays. */
export function compute(p: Prepared): Computed {
  const { n, tables, dur, order } = p;
  const es = new Float64Array(n);
  const ef = new Float64Array(n);
  const ls = new Float64Array(n);
  const lf = new Float64Array(n);
  const ps = new Float64Array(n);
  const pf = new Float64Array(n);
  const tf = new Int32Array(n);
  const ff = new Int32Array(n);
  const esPos = new Int32Array(n);
  const state = new Uint8Array(n);
  const ddStart = new Float64Array(n);
  const allows = new Float64Array(p.m).fill(NaN);
  const ddInstant = p.dataDay * MINUTES_PER_DAY;

  // Forward pass, in topological order.
  for (let oi = 0; oi < n; oi++) {
    const j = order[oi];
    const tb = tables[j];
    const d = dur[j];
    // "A data date on a non-working day means the next working slot."
    const ddPos = tb.startsBefore(ddInstant);
    const dds = tb.start(ddPos);
    ddStart[j] = dds;
    const aS = p.actS[j];
    const aF = p.actF[j];
    if (!Number.isNaN(aS) || !Number.isNaN(aF)) {
      // Started or done: the actual dates stand; links no longer apply to this task.
      let start = aS;
      // A milestone is one instant: its actual finish if given, else its actual start.
      if (d === 0) start = Number.isNaN(aF) ? aS : aF;
      else if (Number.isNaN(start)) start = tb.start(tb.endsAtOrBefore(aF) - d);
      let finish: number;
      if (!Number.isNaN(aF) || d === 0) {
        finish = d === 0 || Number.isNaN(aF) ? start : aF;
        state[j] = STATE_DONE;
      } else {
        // Started, not finished: no earlier than actual start + duration, and no earlier than
        // the end of the data date's first slot (the work is still going on today).
        const planned = tb.end(tb.startsBefore(start) + d - 1);
        const todayEnd = tb.end(ddPos);
        finish = planned > todayEnd ? planned : todayEnd;
        state[j] = STATE_STARTED;
      }
      es[j] = ps[j] = start;
      ef[j] = pf[j] = finish;
      esPos[j] = tb.startsBefore(start);
      continue;
    }
    const net = p.net[j];
    if (d > 0) {
      // Early start: the latest of the data date's first slot, not-earlier-than and every link;
      // negative lags can therefore never pull a task before the data date.
      let pos = ddPos;
      if (!Number.isNaN(net)) {
        const np = tb.startsBefore(net);
        if (np > pos) pos = np;
      }
      for (let k = p.inStart[j]; k < p.inStart[j + 1]; k++) {
        const e = p.inEdges[k];
        const i = p.eFrom[e];
        const b = linkStartBound(p, e, tb, d, ps[i], pf[i]);
        allows[e] = tb.start(b);
        if (b > pos) pos = b;
      }
      esPos[j] = pos;
      es[j] = tb.start(pos);
      ef[j] = tb.end(pos + d - 1);
    } else {
      let t = dds;
      if (!Number.isNaN(net)) {
        const nb = tb.boundaryAtOrAfter(net);
        if (nb > t) t = nb;
      }
      for (let k = p.inStart[j]; k < p.inStart[j + 1]; k++) {
        const e = p.inEdges[k];
        const i = p.eFrom[e];
        const x = linkStartBound(p, e, tb, 0, ps[i], pf[i]);
        allows[e] = x;
        if (x > t) t = x;
      }
      es[j] = ef[j] = t;
    }
    // Pins: successors follow the booked dates, which the engine never moves.
    const pin = p.pin[j];
    if (!Number.isNaN(pin)) {
      ps[j] = pin;
      pf[j] = d === 0 ? pin : tb.end(tb.startsBefore(pin) + d - 1);
    } else {
      ps[j] = es[j];
      pf[j] = ef[j];
    }
    // Clear when every predecessor's rule is met as of the data date's first slot.
    let clear = true;
    for (let k = p.inStart[j]; k < p.inStart[j + 1]; k++)
      if (allows[p.inEdges[k]] > dds) clear = false;
    state[j] = clear ? STATE_CLEAR : STATE_WAITING;
  }

  // The programme's finish is the latest planned finish (booked dates count).
  let finish = -Infinity;
  for (let i = 0; i < n; i++) if (pf[i] > finish) finish = pf[i];
  // Handover: by the end of that day; every late finish is capped there (or at the finish).
  const handoverEnd =
    p.handoverDay === null ? NaN : (p.handoverDay + 1) * MINUTES_PER_DAY;
  const cap = p.handoverDay === null ? finish : handoverEnd;

  // Backward pass, in reverse topological order.
  for (let oi = n - 1; oi >= 0; oi--) {
    const i = order[oi];
    const tb = tables[i];
    const d = dur[i];
    const isMs = d === 0;
    let lsPos = isMs ? 0 : tb.endsAtOrBefore(cap) - d;
    let lsInst = isMs ? tb.boundaryAtOrBefore(cap) : 0;
    for (let k = p.outStart[i]; k < p.outStart[i + 1]; k++) {
      const e = p.outEdges[k];
      const j = p.eTo[e];
      // A pinned successor caps its predecessors at its booked dates (less the lag); its own
      // late dates still come from its successors, so its float shows how far it may move.
      let jS = ls[j];
      let jF = lf[j];
      if (!Number.isNaN(p.pin[j]) && state[j] < STATE_STARTED) {
        if (ps[j] < jS) jS = ps[j];
        if (pf[j] < jF) jF = pf[j];
      }
      const bound = linkLatestSource(p, e, j, jS, jF);
      if (isMs) {
        const x = tb.boundaryAtOrBefore(bound);
        if (x < lsInst) lsInst = x;
      } else if (p.eKind[e] === KIND_SS) {
        const x = tb.startsAtOrBefore(bound) - 1;
        if (x < lsPos) lsPos = x;
      } else {
        const x = tb.endsAtOrBefore(bound) - d;
        if (x < lsPos) lsPos = x;
      }
    }
    if (isMs) {
      ls[i] = lf[i] = lsInst;
    } else {
      ls[i] = tb.start(lsPos);
      lf[i] = tb.end(lsPos + d - 1);
    }
    // Total float, in slots of the task's own calendar.
    if (isMs) tf[i] = tb.slotsBetween(ps[i], ls[i]);
    else if (state[i] >= STATE_STARTED)
      tf[i] = lsPos + d - tb.endsAtOrBefore(pf[i]);
    else if (!Number.isNaN(p.pin[i]))
      tf[i] = lsPos - tb.startsBefore(ps[i]); // late start − booked start
    else tf[i] = lsPos - esPos[i];
  }

  // Free float: the least slack to each successor's rule (against its planned dates) and to
  // handover (or the finish), and never more than total float.
  for (let i = 0; i < n; i++) {
    const tb = tables[i];
    const d = dur[i];
    const isMs = d === 0;
    const finishQ = isMs ? 0 : tb.endsAtOrBefore(pf[i]);
    const startP = isMs ? 0 : tb.startsBefore(ps[i]);
    let best = isMs
      ? tb.slotsBetween(pf[i], cap)
      : tb.endsAtOrBefore(cap) - finishQ;
    for (let k = p.outStart[i]; k < p.outStart[i + 1]; k++) {
      const e = p.outEdges[k];
      const j = p.eTo[e];
      if (state[j] >= STATE_STARTED) continue; // links no longer bind a started task
      const bound = linkLatestSource(p, e, j, ps[j], pf[j]);
      let slack: number;
      if (isMs) slack = tb.slotsBetween(ps[i], bound);
      else if (p.eKind[e] === KIND_SS)
        slack = tb.startsAtOrBefore(bound) - 1 - startP;
      else slack = tb.endsAtOrBefore(bound) - finishQ;
      if (slack < best) best = slack;
    }
    ff[i] = best < tf[i] ? best : tf[i];
  }

  let handoverSlipSlots: number | null = null;
  if (p.handoverDay !== null) {
    // Slip is counted on the workshop calendar, from the end of its handover day.
    const ws = p.workshop;
    const hEnd = ws.boundaryAtOrBefore(handoverEnd);
    handoverSlipSlots =
      n === 0 || finish <= hEnd
        ? 0
        : Math.max(0, ws.slotsBetween(hEnd, finish));
  }

  const c: Computed = {
    p,
    es,
    ef,
    ls,
    lf,
    ps,
    pf,
    tf,
    ff,
    state,
    allows,
    ddStart,
    finish,
    handoverEnd,
    handoverSlipSlots,
    criticalPath: [],
  };
  c.criticalPath = drivingPath(c);
  return c;
}

function byFloatThenId(c: Computed, a: number, b: number): number {
  if (c.tf[a] !== c.tf[b]) return c.tf[a] - c.tf[b];
  const x = c.p.ids[a];
  const y = c.p.ids[b];
  return x < y ? -1 : x > y ? 1 : 0;
}

/**
 * The driving path: from the task that ends at the programme's finish, walk back through the
 * predecessor whose rule sets the task's start (ties: lower total float, then id in string
 * order, so input order never matters). It exists even when nothing is critical.
 */
function drivingPath(c: Computed): number[] {
  const { p } = c;
  let end = -1;
  for (let i = 0; i < p.n; i++) {
    if (c.pf[i] !== c.finish) continue;
    if (end < 0 || byFloatThenId(c, i, end) < 0) end = i;
  }
  if (end < 0) return [];
  const path = [end];
  let j = end;
  for (;;) {
    if (c.state[j] >= STATE_STARTED) break;
    let best = -1;
    for (let k = p.inStart[j]; k < p.inStart[j + 1]; k++) {
      const e = p.inEdges[k];
      if (!(c.allows[e] >= c.ps[j])) continue; // this link does not drive j's start
      const i = p.eFrom[e];
      if (best < 0 || byFloatThenId(c, i, best) < 0) best = i;
    }
    if (best < 0) break;
    path.push(best);
    j = best;
  }
  return path.reverse();
}

// ---------- presentation ----------

function capitalise(s: string): string {
  return s.length === 0 ? s : s[0].toUpperCase() + s.slice(1);
}

/** "Thu 5 Mar morning", "Thu 5 Mar afternoon", or "Thu 5 Mar 10:15" for other starts. */
export function describeStart(t: number, tb: SlotTable): string {
  const day = Math.floor(t / MINUTES_PER_DAY);
  const m = t - day * MINUTES_PER_DAY;
  if (m === tb.dayStart) return `${humanDay(day)} morning`;
  if (m === NOON) return `${humanDay(day)} afternoon`;
  return `${humanDay(day)} ${formatTime(m)}`;
}

/** "Thu 5 Mar" for a day's end, "Thu 5 Mar morning" for 12:00, else with the time. */
function describeFinish(t: number, tb: SlotTable): string {
  let day = Math.floor(t / MINUTES_PER_DAY);
  let m = t - day * MINUTES_PER_DAY;
  if (m === 0) {
    day -= 1;
    m = MINUTES_PER_DAY;
  }
  if (m >= tb.dayEnd) return humanDay(day);
  if (m === NOON) return `${humanDay(day)} morning`;
  return `${humanDay(day)} ${formatTime(m)}`;
}

/** Another booking's dates in words: "Thu 5 Mar morning", "Thu 5 Mar", "Thu 5 Mar to Fri 6 Mar". */
export function describeInterval(s: number, f: number, tb: SlotTable): string {
  const sDay = Math.floor(s / MINUTES_PER_DAY);
  const sm = s - sDay * MINUTES_PER_DAY;
  let fDay = Math.floor(f / MINUTES_PER_DAY);
  let fm = f - fDay * MINUTES_PER_DAY;
  if (fm === 0 && fDay > sDay) {
    fDay -= 1;
    fm = MINUTES_PER_DAY;
  }
  const fromDayStart = sm <= tb.dayStart;
  const toDayEnd = fm >= tb.dayEnd;
  if (sDay === fDay) {
    if (fromDayStart && toDayEnd) return humanDay(sDay);
    if (fromDayStart && fm === NOON) return `${humanDay(sDay)} morning`;
    if (sm === NOON && toDayEnd) return `${humanDay(sDay)} afternoon`;
    return `${humanDay(sDay)} ${formatTime(sm)}–${formatTime(fm)}`;
  }
  const from = fromDayStart
    ? humanDay(sDay)
    : sm === NOON
      ? `${humanDay(sDay)} afternoon`
      : `${humanDay(sDay)} ${formatTime(sm)}`;
  return `${from} to ${describeFinish(fDay * MINUTES_PER_DAY + fm, tb)}`;
}

function days(slots: number): number {
  return slots / 2 + 0; // + 0 turns -0 into 0
}

function daysWord(slots: number): string {
  const d = Math.abs(slots) / 2;
  return `${d} working day${d === 1 ? "" : "s"}`;
}

/** Does [a, b) contain (part of) a working slot of tb? */
function coversWorkingTime(tb: SlotTable, a: number, b: number): boolean {
  const k = tb.endsAtOrBefore(a); // first slot ending after a
  return tb.start(k) < b;
}

/** Clash problems per task: overlaps with `busy` and with same-resource tasks of this input. */
function clashes(c: Computed): Map<number, { at: number; message: string }[]> {
  const { p } = c;
  const out = new Map<number, { at: number; message: string }[]>();
  type Ev = {
    s: number;
    f: number;
    task: number;
    ref: string | null;
    resource: string;
  };
  const byRes = new Map<string, Ev[]>();
  const add = (ev: Ev) => {
    let l = byRes.get(ev.resource);
    if (!l) byRes.set(ev.resource, (l = []));
    l.push(ev);
  };
  for (let i = 0; i < p.n; i++) {
    const r = p.resource[i];
    // A milestone takes no time; finished work is history, not a clash to act on.
    if (r == null || p.dur[i] === 0 || c.state[i] === STATE_DONE) continue;
    add({ s: c.ps[i], f: c.pf[i], task: i, ref: null, resource: r });
  }
  if (byRes.size === 0) return out;
  for (const b of p.busy)
    if (byRes.has(b.resource))
      add({
        s: b.start,
        f: b.finish,
        task: -1,
        ref: b.ref,
        resource: b.resource,
      });
  const push = (task: number, at: number, message: string) => {
    let l = out.get(task);
    if (!l) out.set(task, (l = []));
    l.push({ at, message });
  };
  for (const [res, evs] of byRes) {
    evs.sort((a, b) => a.s - b.s || a.f - b.f);
    const active: Ev[] = [];
    for (const ev of evs) {
      // Drop intervals that ended before this one starts.
      let w = 0;
      for (const a of active) if (a.f > ev.s) active[w++] = a;
      active.length = w;
      for (const a of active) {
        if (a.task < 0 && ev.task < 0) continue;
        const s = ev.s > a.s ? ev.s : a.s;
        const f = ev.f < a.f ? ev.f : a.f;
        if (!(s < f)) continue;
        // Only working time counts: a Friday-to-Monday task does not clash with a Saturday job.
        if (ev.task >= 0 && !coversWorkingTime(p.tables[ev.task], s, f))
          continue;
        if (a.task >= 0 && !coversWorkingTime(p.tables[a.task], s, f)) continue;
        const who = capitalise(res);
        if (ev.task >= 0) {
          const tb = p.tables[ev.task];
          const what = a.task >= 0 ? p.names[a.task] : a.ref;
          push(
            ev.task,
            a.s,
            `${who} is already booked ${describeInterval(a.s, a.f, tb)}${what ? ` (${what})` : ""}`,
          );
        }
        if (a.task >= 0) {
          const tb = p.tables[a.task];
          const what = ev.task >= 0 ? p.names[ev.task] : ev.ref;
          push(
            a.task,
            ev.s,
            `${who} is already booked ${describeInterval(ev.s, ev.f, tb)}${what ? ` (${what})` : ""}`,
          );
        }
      }
      active.push(ev);
    }
  }
  return out;
}

function nonWorking(
  list: Problem[],
  tb: SlotTable,
  field: string,
  t: number,
): void {
  const day = Math.floor(t / MINUTES_PER_DAY);
  if (!tb.isWorkingDay(day))
    list.push({
      code: "non-working-day",
      message: `${field} ${humanDay(day)} is not a working day on this task's calendar`,
    });
}

/** Problems of each task, in a fixed order of codes. */
function problemsOf(c: Computed): Problem[][] {
  const { p } = c;
  const clash = clashes(c);
  const result: Problem[][] = new Array(p.n);
  for (let i = 0; i < p.n; i++) {
    const list: Problem[] = [];
    const tb = p.tables[i];
    const name = p.names[i];
    const pin = p.pin[i];
    if (!Number.isNaN(pin) && c.state[i] < STATE_STARTED && c.es[i] > pin) {
      // Name the predecessor that now allows only a later start (the latest, then by id).
      let who = -1;
      let at = -Infinity;
      for (let k = p.inStart[i]; k < p.inStart[i + 1]; k++) {
        const e = p.inEdges[k];
        const a = c.allows[e];
        const from = p.eFrom[e];
        if (a > pin && (a > at || (a === at && p.ids[from] < p.ids[who]))) {
          who = from;
          at = a;
        }
      }
      const when = describeStart(c.es[i], tb);
      list.push({
        code: "booking-too-early",
        message:
          who >= 0
            ? `Booked for ${describeStart(pin, tb)}, but ${p.names[who]} allows a start only from ${describeStart(at, tb)}`
            : `Booked for ${describeStart(pin, tb)}, but it can start only from ${when}`,
      });
    }
    // A booked or actual date on a day the task's calendar does not work.
    if (!Number.isNaN(pin)) nonWorking(list, tb, "Booked start", pin);
    if (!Number.isNaN(p.actS[i]))
      nonWorking(list, tb, "Actual start", p.actS[i]);
    if (!Number.isNaN(p.actF[i]))
      nonWorking(list, tb, "Actual finish", p.actF[i]);
    const cl = clash.get(i);
    if (cl) {
      cl.sort(
        (a, b) =>
          a.at - b.at ||
          (a.message < b.message ? -1 : a.message > b.message ? 1 : 0),
      );
      for (const x of cl) list.push({ code: "clash", message: x.message });
    }
    if (c.state[i] === STATE_STARTED) {
      // Overdue when actual start + duration is at or before the data date's first slot.
      const due = tb.end(tb.startsBefore(c.ps[i]) + p.dur[i] - 1);
      if (due <= c.ddStart[i])
        list.push({
          code: "overdue",
          message: `${name} was due to finish by ${describeFinish(due, tb)} and is not marked done`,
        });
    }
    if (c.tf[i] < 0) {
      const against =
        p.handoverDay === null
          ? "the programme's finish"
          : `handover on ${humanDay(p.handoverDay)}`;
      list.push({
        code: "handover-at-risk",
        message: `${name} is ${daysWord(c.tf[i])} behind what ${against} allows`,
      });
    }
    result[i] = list;
  }
  return result;
}

function waitingOn(c: Computed, j: number): WaitingOn[] {
  const { p } = c;
  if (c.state[j] !== STATE_WAITING) return [];
  // One entry per predecessor, at the latest its links allow; sorted by allowsFrom, then id.
  const preds: number[] = [];
  const at: number[] = [];
  for (let k = p.inStart[j]; k < p.inStart[j + 1]; k++) {
    const e = p.inEdges[k];
    const a = c.allows[e];
    if (!(a > c.ddStart[j])) continue;
    const i = p.eFrom[e];
    const seen = preds.indexOf(i);
    if (seen < 0) {
      preds.push(i);
      at.push(a);
    } else if (a > at[seen]) at[seen] = a;
  }
  if (preds.length === 1)
    return [{ task: p.ids[preds[0]], allowsFrom: formatLocal(at[0]) }];
  const list: WaitingOn[] = new Array(preds.length);
  const order = preds.map((_, k) => k);
  if (order.length > 1)
    order.sort(
      (x, y) => at[x] - at[y] || (p.ids[preds[x]] < p.ids[preds[y]] ? -1 : 1),
    );
  for (let k = 0; k < order.length; k++)
    list[k] = {
      task: p.ids[preds[order[k]]],
      allowsFrom: formatLocal(at[order[k]]),
    };
  return list;
}

const STATE_NAMES = ["waiting", "clear", "started", "done"] as const;

/** Internal: format computed arrays as the JSON contract's result. */
export function present(c: Computed): ProgrammeResult {
  const { p } = c;
  const problems = problemsOf(c);
  const tasks: TaskResult[] = new Array(p.n);
  for (let i = 0; i < p.n; i++) {
    tasks[i] = {
      id: p.ids[i],
      earlyStart: formatLocal(c.es[i]),
      earlyFinish: formatLocal(c.ef[i]),
      lateStart: formatLocal(c.ls[i]),
      lateFinish: formatLocal(c.lf[i]),
      totalFloatDays: days(c.tf[i]),
      freeFloatDays: days(c.ff[i]),
      critical: c.tf[i] <= 0,
      plannedStart: formatLocal(c.ps[i]),
      plannedFinish: formatLocal(c.pf[i]),
      readiness: { state: STATE_NAMES[c.state[i]], waitingOn: waitingOn(c, i) },
      problems: problems[i],
    };
  }
  return {
    finish: p.n === 0 ? null : formatLocal(c.finish),
    handoverSlipDays:
      c.handoverSlipSlots === null ? null : days(c.handoverSlipSlots),
    criticalPath: c.criticalPath.map((i) => p.ids[i]),
    tasks,
  };
}

/** Schedule a programme (one job or a portfolio); throws ProgrammeInputError on bad input. */
export function scheduleProgramme(input: ProgrammeInput): ProgrammeResult {
  return present(compute(prepare(input)));
}
