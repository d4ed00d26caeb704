// Property tests over random networks (spec "Correctness"). The link rules are checked against
// an oracle written here from the spec's words: it lists each calendar's slots day by day and
// scans them, and does real-time arithmetic with luxon directly, so it shares none of the
// engine's slot-position arithmetic (calendar.ts) or zone tables (zone.ts).
import fc from "fast-check";
import { DateTime } from "luxon";
import { describe, expect, it } from "vitest";
import { workingDaysBetween } from "./calendar";
import { scheduleProgramme } from "./schedule";
import { dayN } from "./test-helpers";
import type {
  CalendarInput,
  LinkInput,
  ProgrammeInput,
  ProgrammeResult,
  TaskInput,
  TaskResult,
} from "./types";

const ZONE = "Europe/London";
const BASE = "2026-01-05";

// ---------- random networks ----------

const calArb = fc.record({
  // Every calendar works Wednesdays, so any intersection has working days.
  weekdays: fc.subarray([1, 2, 4, 5, 6, 7]).map((w) => [...w, 3].sort()),
  dayStart: fc.constantFrom("07:00", "07:30", "08:00", "09:00"),
  dayEnd: fc.constantFrom("15:00", "16:30", "17:00"),
  region: fc.constantFrom(null, "GB-ENG", "GB-SCT", "GB-NIR"),
  daysOff: fc.array(fc.integer({ min: 0, max: 120 }), { maxLength: 3 }),
});

const taskArb = fc.record({
  dur: fc.integer({ min: 0, max: 8 }),
  cals: fc.uniqueArray(fc.nat(2), { minLength: 1, maxLength: 2 }),
  net: fc.option(fc.integer({ min: 0, max: 30 }), { nil: null }),
  resource: fc.option(fc.constantFrom("p1", "p2"), { nil: null }),
  pin: fc.option(fc.integer({ min: 0, max: 30 }), { nil: null }),
  started: fc.option(fc.integer({ min: 1, max: 10 }), { nil: null }),
  finished: fc.boolean(),
});

const linkArb = fc.record({
  a: fc.nat(),
  b: fc.nat(),
  kind: fc.constantFrom("FS", "FS", "SS", "FF") as fc.Arbitrary<
    "FS" | "SS" | "FF"
  >,
  elapsed: fc.boolean(),
  steps: fc.integer({ min: -4, max: 6 }),
  hours: fc.integer({ min: -24, max: 72 }),
});

const netArb = fc.record({
  cals: fc.array(calArb, { minLength: 3, maxLength: 3 }),
  data: fc.integer({ min: 0, max: 330 }),
  tasks: fc.array(taskArb, { minLength: 1, maxLength: 9 }),
  links: fc.array(linkArb, { maxLength: 14 }),
  handover: fc.option(fc.integer({ min: 0, max: 60 }), { nil: null }),
  progress: fc.boolean(),
});

type Net = typeof netArb extends fc.Arbitrary<infer T> ? T : never;

function build(net: Net, opts: { progress?: boolean } = {}): ProgrammeInput {
  const progress = opts.progress ?? net.progress;
  const dataDate = dayN(net.data, BASE);
  const calendars: CalendarInput[] = net.cals.map((c, k) => ({
    id: k === 0 ? "workshop" : `c${k}`,
    workingWeekdays: c.weekdays,
    dayStart: c.dayStart,
    dayEnd: c.dayEnd,
    holidayRegion: c.region as CalendarInput["holidayRegion"],
    daysOff: c.daysOff.map((d) => dayN(net.data + d - 30, BASE)),
  }));
  const n = net.tasks.length;
  const tasks: TaskInput[] = net.tasks.map((t, i) => {
    const task: TaskInput = {
      id: `t${(i * 5) % 11}-${i}`, // ids whose string order differs from input order
      calendar: t.cals.map((k) => calendars[k].id),
      durationDays: t.dur / 2,
      resource: t.resource,
      notEarlierThan: t.net === null ? null : dayN(net.data + t.net, BASE),
    };
    if (progress && t.pin !== null)
      task.bookedStart = dayN(net.data + t.pin, BASE);
    if (progress && t.started !== null && i < n / 2) {
      task.bookedStart = null;
      task.actualStart = dayN(net.data - t.started, BASE);
      if (t.finished) task.actualFinish = dayN(net.data - 1, BASE);
    }
    return task;
  });
  const links: LinkInput[] = [];
  for (const l of net.links) {
    const x = l.a % n;
    const y = l.b % n;
    if (x === y) continue;
    links.push({
      from: tasks[Math.min(x, y)].id,
      to: tasks[Math.max(x, y)].id,
      kind: l.kind,
      lag: l.elapsed ? l.hours : l.steps / 2,
      lagUnit: l.elapsed ? "elapsedHours" : "workingDays",
    });
  }
  return {
    timeZone: ZONE,
    dataDate,
    handover:
      net.handover === null ? null : dayN(net.data + net.handover, BASE),
    calendars,
    tasks,
    links,
    busy: [
      {
        resource: "p1",
        start: `${dayN(net.data + 2, BASE)}T08:00`,
        finish: `${dayN(net.data + 2, BASE)}T12:00`,
        ref: "job 1",
      },
    ],
  };
}

// ---------- the oracle ----------

type Slot = { start: string; end: string };
const slotCache = new Map<string, Slot[]>();

/** Every slot of a task's calendars (intersected) in a wide range, listed day by day. */
function slotsOf(input: ProgrammeInput, t: TaskInput): Slot[] {
  const ids =
    t.calendar == null
      ? ["workshop"]
      : Array.isArray(t.calendar)
        ? t.calendar
        : [t.calendar];
  const cals = ids.map((id) => input.calendars!.find((c) => c.id === id)!);
  const key = JSON.stringify([cals, input.dataDate]);
  let slots = slotCache.get(key);
  if (slots) return slots;
  const ds = cals
    .map((c) => c.dayStart ?? "08:00")
    .sort()
    .at(-1)!;
  const de = cals.map((c) => c.dayEnd ?? "16:30").sort()[0];
  slots = [];
  for (const d of workingDaysBetween(
    cals,
    dayN(-120, input.dataDate),
    dayN(300, input.dataDate),
  )) {
    slots.push(
      { start: `${d}T${ds}`, end: `${d}T12:00` },
      { start: `${d}T12:00`, end: `${d}T${de}` },
    );
  }
  if (slotCache.size > 500) slotCache.clear();
  slotCache.set(key, slots);
  return slots;
}

const plusHours = (local: string, h: number) =>
  DateTime.fromISO(local, { zone: ZONE })
    .plus({ hours: h })
    .toFormat("yyyy-MM-dd'T'HH:mm");
const firstIndex = (slots: Slot[], pred: (s: Slot) => boolean) =>
  slots.findIndex(pred);

/** The earliest start a link allows its successor, from the spec's rules (oracle). */
function allowedStart(
  input: ProgrammeInput,
  link: LinkInput,
  pred: { start: string; finish: string },
  succ: TaskInput,
): string {
  const slots = slotsOf(input, succ);
  const n = Math.round(succ.durationDays * 2);
  const src = link.kind === "SS" ? pred.start : pred.finish;
  const lag = link.lag ?? 0;
  if (link.lagUnit === "elapsedHours") {
    const t = plusHours(src, lag);
    if (n === 0) {
      // A milestone: the first slot boundary at or after the instant.
      const s = slots[firstIndex(slots, (x) => x.start >= t)].start;
      const e = slots[firstIndex(slots, (x) => x.end >= t)].end;
      return s < e ? s : e;
    }
    if (link.kind === "FF")
      return slots[firstIndex(slots, (x) => x.end >= t) - n + 1].start;
    return slots[firstIndex(slots, (x) => x.start >= t)].start;
  }
  const steps = Math.round(lag * 2);
  const k = firstIndex(slots, (x) => x.start >= src); // snap forward to a boundary
  if (n === 0) {
    if (steps === 0) {
      const e = slots[firstIndex(slots, (x) => x.end >= src)].end;
      return e < slots[k].start ? e : slots[k].start;
    }
    return slots[k + steps - 1].end;
  }
  return link.kind === "FF"
    ? slots[k + steps - n].start
    : slots[k + steps].start;
}

function byId(r: ProgrammeResult): Map<string, TaskResult> {
  return new Map(r.tasks.map((t) => [t.id, t]));
}

const isFixed = (t: TaskInput) =>
  t.actualStart != null || t.actualFinish != null;
const RUNS = { numRuns: 120 };

describe("properties over random networks (fast-check)", () => {
  it("early start is exactly the latest of data date, not-earlier-than and every link rule", () => {
    fc.assert(
      fc.property(netArb, (net) => {
        const input = build(net);
        const r = byId(scheduleProgramme(input));
        for (const t of input.tasks) {
          if (isFixed(t)) continue;
          const slots = slotsOf(input, t);
          let bound =
            slots[
              firstIndex(slots, (x) => x.start >= `${input.dataDate}T00:00`)
            ].start;
          if (t.notEarlierThan) {
            const net0 = `${t.notEarlierThan}T00:00`;
            const s = slots[firstIndex(slots, (x) => x.start >= net0)].start;
            if (s > bound) bound = s;
          }
          for (const l of input.links!) {
            if (l.to !== t.id) continue;
            const p = r.get(l.from)!;
            const a = allowedStart(
              input,
              l,
              { start: p.plannedStart, finish: p.plannedFinish },
              t,
            );
            // The rule holds …
            expect(r.get(t.id)!.earlyStart >= a).toBe(true);
            if (a > bound) bound = a;
          }
          // … and the early start is no later than the rules need.
          expect([t.id, r.get(t.id)!.earlyStart]).toEqual([t.id, bound]);
        }
      }),
      RUNS,
    );
  }, 60000);

  it("late dates obey every link rule too, and no late finish passes handover or the finish", () => {
    fc.assert(
      fc.property(netArb, (net) => {
        const input = build(net, { progress: false });
        const res = scheduleProgramme(input);
        const r = byId(res);
        const cap = input.handover ? `${input.handover}T24:00` : res.finish!;
        for (const t of input.tasks) {
          expect(r.get(t.id)!.lateFinish <= cap).toBe(true);
          for (const l of input.links!) {
            if (l.to !== t.id) continue;
            const p = r.get(l.from)!;
            const a = allowedStart(
              input,
              l,
              { start: p.lateStart, finish: p.lateFinish },
              t,
            );
            expect([l, r.get(t.id)!.lateStart >= a]).toEqual([l, true]);
          }
        }
      }),
      RUNS,
    );
  }, 60000);

  it("no task occupies a non-working slot: its dates span exactly its duration in working slots", () => {
    fc.assert(
      fc.property(netArb, (net) => {
        const input = build(net);
        const r = byId(scheduleProgramme(input));
        for (const t of input.tasks) {
          const n = Math.round(t.durationDays * 2);
          const slots = slotsOf(input, t);
          const res = r.get(t.id)!;
          const pairs: [string, string][] = [[res.lateStart, res.lateFinish]];
          // Early and planned dates of started or finished work are the input's actual dates,
          // and a pin's planned dates its booking, which may fall on any day (non-working-day).
          if (!isFixed(t)) pairs.push([res.earlyStart, res.earlyFinish]);
          if (!t.bookedStart && !isFixed(t))
            pairs.push([res.plannedStart, res.plannedFinish]);
          for (const [s, f] of pairs) {
            if (n === 0) {
              expect(s).toBe(f);
              continue;
            }
            const i = firstIndex(slots, (x) => x.start === s);
            expect([t.id, s, i >= 0]).toEqual([t.id, s, true]);
            expect([t.id, slots[i + n - 1].end]).toEqual([t.id, f]);
          }
        }
      }),
      RUNS,
    );
  }, 60000);

  it("early start ≤ late start and float ≥ 0 when handover is not before the computed finish", () => {
    fc.assert(
      fc.property(netArb, fc.integer({ min: 0, max: 10 }), (net, extra) => {
        const input = build(net, { progress: false });
        const free = scheduleProgramme({ ...input, handover: null });
        const late = scheduleProgramme({
          ...input,
          handover: dayN(extra, free.finish!.slice(0, 10)),
        });
        for (const r of [free, late]) {
          for (const t of r.tasks) {
            expect(t.earlyStart <= t.lateStart).toBe(true);
            expect(t.totalFloatDays >= 0).toBe(true);
            expect(t.freeFloatDays <= t.totalFloatDays).toBe(true);
          }
          expect(r.handoverSlipDays ?? 0).toBe(0);
        }
        // Without a handover something is critical: the driving path's last task.
        expect(byId(free).get(free.criticalPath.at(-1)!)!.totalFloatDays).toBe(
          0,
        );
      }),
      RUNS,
    );
  }, 60000);

  it("the driving path runs unbroken along links to the programme finish", () => {
    fc.assert(
      fc.property(netArb, (net) => {
        const input = build(net);
        const res = scheduleProgramme(input);
        const r = byId(res);
        const path = res.criticalPath;
        expect(path.length > 0).toBe(true);
        expect(r.get(path.at(-1)!)!.plannedFinish).toBe(res.finish);
        for (let k = 1; k < path.length; k++) {
          expect(
            input.links!.some(
              (l) => l.from === path[k - 1] && l.to === path[k],
            ),
          ).toBe(true);
        }
        // Free float never exceeds total float, anywhere.
        for (const t of res.tasks)
          expect(t.freeFloatDays <= t.totalFloatDays).toBe(true);
      }),
      RUNS,
    );
  }, 60000);

  it("shuffling the order of tasks and links changes nothing", () => {
    fc.assert(
      fc.property(netArb, fc.integer(), (net, seed) => {
        const input = build(net);
        const shuffle = <T>(xs: T[], s: number) => {
          const a = [...xs];
          let x = s >>> 0 || 1;
          for (let i = a.length - 1; i > 0; i--) {
            x = (Math.imul(x, 1103515245) + 12345) >>> 0;
            const j = x % (i + 1);
            [a[i], a[j]] = [a[j], a[i]];
          }
          return a;
        };
        const shuffled = {
          ...input,
          tasks: shuffle(input.tasks, seed),
          links: shuffle(input.links!, seed ^ 0x5bd1e995),
        };
        const a = scheduleProgramme(input);
        const b = scheduleProgramme(shuffled);
        const sorted = (r: ProgrammeResult) => ({
          ...r,
          tasks: [...r.tasks].sort((x, y) => (x.id < y.id ? -1 : 1)),
        });
        expect(sorted(b)).toEqual(sorted(a));
      }),
      RUNS,
    );
  }, 60000);

  it("moving a task later never moves another task earlier", () => {
    fc.assert(
      fc.property(
        netArb,
        fc.nat(),
        fc.integer({ min: 1, max: 15 }),
        (net, pick, days) => {
          const input = build(net);
          const k = pick % input.tasks.length;
          const t = input.tasks[k];
          if (isFixed(t) || t.bookedStart) return; // actual and booked dates do not move
          const before = byId(scheduleProgramme(input));
          const moved = {
            ...t,
            notEarlierThan: dayN(
              days,
              before.get(t.id)!.earlyStart.slice(0, 10),
            ),
          };
          const after = scheduleProgramme({
            ...input,
            tasks: input.tasks.map((x, i) => (i === k ? moved : x)),
          });
          expect(
            after.tasks.find((x) => x.id === t.id)!.earlyStart >
              before.get(t.id)!.earlyStart,
          ).toBe(true);
          for (const x of after.tasks) {
            const b = before.get(x.id)!;
            expect([
              x.id,
              x.earlyStart >= b.earlyStart,
              x.plannedStart >= b.plannedStart,
            ]).toEqual([x.id, true, true]);
          }
        },
      ),
      RUNS,
    );
  }, 60000);
});
