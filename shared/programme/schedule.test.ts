// Hand-checked small cases. Unless said otherwise: workshop calendar Mon–Fri 08:00–16:30, no
// bank holidays, data date Mon 2 Mar 2026. March 2026: Mon 2, Tue 3, Wed 4, Thu 5, Fri 6,
// Sat 7, Sun 8, Mon 9, Tue 10. Slots: morning 08:00–12:00, afternoon 12:00–16:30.
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { scheduleProgramme } from "./schedule";
import { task } from "./test-helpers";
import {
  ProgrammeInputError,
  type CalendarInput,
  type LinkInput,
  type ProgrammeInput,
  type TaskInput,
} from "./types";

const WORKSHOP: CalendarInput = { id: "workshop", holidayRegion: null };

function run(
  tasks: TaskInput[],
  links: LinkInput[] = [],
  extra: Partial<ProgrammeInput> = {},
) {
  return scheduleProgramme({
    dataDate: "2026-03-02",
    calendars: [WORKSHOP],
    tasks,
    links,
    ...extra,
  });
}
const dates = (r: ReturnType<typeof run>, id: string) => {
  const t = task(r, id);
  return [t.earlyStart, t.earlyFinish];
};

describe('the spec worked example (programme-engine.md, "The JSON contract")', () => {
  it("comes out exactly, field for field and in order", () => {
    const dir = join(import.meta.dirname, "fixtures");
    const input = JSON.parse(
      readFileSync(join(dir, "spec-example.json"), "utf8"),
    );
    const expected = JSON.parse(
      readFileSync(join(dir, "spec-example.expected.json"), "utf8"),
    );
    const r = scheduleProgramme(input);
    // fix: NET Tue 3 → Tue 08:00, 2 days → Wed 16:30. template: FS → Thu 08:00–12:00 (Fri 6 is a
    // day off). Handover end of Tue 10 → template late Tue 12:00–16:30; fix late finish Tue
    // 12:00, late start 4 slots back = Thu 12:00. Floats 2.5 days; clash with job 12 Thu morning.
    expect(r).toEqual(expected);
    expect(JSON.stringify(r)).toBe(JSON.stringify(expected));
  });
});

describe("links", () => {
  it("FS with lag 0 after a 12:00 finish starts at 12:00 the same day", () => {
    // A: Mon morning (0.5 day) ends 12:00; B starts in the afternoon slot.
    const r = run(
      [
        { id: "A", durationDays: 0.5 },
        { id: "B", durationDays: 1 },
      ],
      [{ from: "A", to: "B" }],
    );
    expect(dates(r, "A")).toEqual(["2026-03-02T08:00", "2026-03-02T12:00"]);
    expect(dates(r, "B")).toEqual(["2026-03-02T12:00", "2026-03-03T12:00"]);
  });

  it("FS with lag 0 after a day-end finish starts the next working morning (Fri → Mon)", () => {
    const r = run(
      [
        { id: "A", durationDays: 1, notEarlierThan: "2026-03-06" },
        { id: "B", durationDays: 1 },
      ],
      [{ from: "A", to: "B" }],
    );
    expect(dates(r, "B")).toEqual(["2026-03-09T08:00", "2026-03-09T16:30"]);
  });

  it("FS +1 working day and FS −0.5 working day", () => {
    // A Mon 08:00–16:30 snaps to Tue 08:00; +2 slots = Wed 08:00.
    // C Mon–Tue ends Tue 16:30, snaps to Wed 08:00; −1 slot = Tue 12:00.
    const r = run(
      [
        { id: "A", durationDays: 1 },
        { id: "B", durationDays: 1 },
        { id: "C", durationDays: 2 },
        { id: "D", durationDays: 0.5 },
      ],
      [
        { from: "A", to: "B", kind: "FS", lag: 1 },
        { from: "C", to: "D", kind: "FS", lag: -0.5 },
      ],
    );
    expect(dates(r, "B")).toEqual(["2026-03-04T08:00", "2026-03-04T16:30"]);
    expect(dates(r, "D")).toEqual(["2026-03-03T12:00", "2026-03-03T16:30"]);
  });

  it("a negative lag never pulls a task before the data date", () => {
    // A Mon; B FS −3 days would start Wed 25 Feb; it is held at the data date, Mon 2 08:00.
    const r = run(
      [
        { id: "A", durationDays: 1 },
        { id: "B", durationDays: 1 },
      ],
      [{ from: "A", to: "B", lag: -3 }],
    );
    expect(dates(r, "B")).toEqual(["2026-03-02T08:00", "2026-03-02T16:30"]);
    // A negative lag against a later data date: data date Wed 4, A done Mon; B FS −1 from Mon
    // 16:30 (snap Tue 08:00, −2 slots = Mon 08:00) is held at Wed 08:00.
    const r2 = run(
      [
        {
          id: "A",
          durationDays: 1,
          actualStart: "2026-03-02",
          actualFinish: "2026-03-02",
        },
        { id: "B", durationDays: 1 },
      ],
      [{ from: "A", to: "B", lag: -1 }],
      { dataDate: "2026-03-04" },
    );
    expect(dates(r2, "B")).toEqual(["2026-03-04T08:00", "2026-03-04T16:30"]);
    expect(task(r2, "B").readiness).toEqual({ state: "clear", waitingOn: [] });
  });

  it("SS +0.5: the successor starts half a day after the predecessor starts", () => {
    const r = run(
      [
        { id: "A", durationDays: 2 },
        { id: "B", durationDays: 1 },
      ],
      [{ from: "A", to: "B", kind: "SS", lag: 0.5 }],
    );
    expect(dates(r, "B")).toEqual(["2026-03-02T12:00", "2026-03-03T12:00"]);
  });

  it("FF +0: the successor finishes with the predecessor", () => {
    // A Mon–Tue ends Tue 16:30; B (0.5) must finish no earlier: Tue 12:00–16:30.
    const r = run(
      [
        { id: "A", durationDays: 2 },
        { id: "B", durationDays: 0.5 },
      ],
      [{ from: "A", to: "B", kind: "FF" }],
    );
    expect(dates(r, "B")).toEqual(["2026-03-03T12:00", "2026-03-03T16:30"]);
    // waitingOn for FF: the finish bound less the duration (Tue 12:00).
    expect(task(r, "B").readiness.waitingOn).toEqual([
      { task: "A", allowsFrom: "2026-03-03T12:00" },
    ]);
  });

  it("elapsed-hour FS lags start at the first slot at or after the instant", () => {
    // A ends Mon 16:30. +18 h = Tue 10:30 → first slot start ≥ is Tue 12:00.
    // +20 h = Tue 12:30 → Wed 08:00. +15.5 h = Tue 08:00 exactly → Tue 08:00.
    const tasks = [
      { id: "A", durationDays: 1 },
      { id: "B18", durationDays: 0.5 },
      { id: "B20", durationDays: 0.5 },
      { id: "B155", durationDays: 0.5 },
    ];
    const r = run(tasks, [
      { from: "A", to: "B18", lag: 18, lagUnit: "elapsedHours" },
      { from: "A", to: "B20", lag: 20, lagUnit: "elapsedHours" },
      { from: "A", to: "B155", lag: 15.5, lagUnit: "elapsedHours" },
    ]);
    expect(task(r, "B18").earlyStart).toBe("2026-03-03T12:00");
    expect(task(r, "B20").earlyStart).toBe("2026-03-04T08:00");
    expect(task(r, "B155").earlyStart).toBe("2026-03-03T08:00");
  });

  it("an elapsed-hour FF lag finishes at the first slot end at or after the instant", () => {
    // A ends Tue 16:30; +1 h = 17:30 → first end of a B slot ≥ 17:30 is Wed 12:00, so B (0.5)
    // runs Wed 08:00–12:00. The backward pass mirrors it in real time: B's late finish is the
    // programme's finish (Wed 12:00), so A may finish by Wed 11:00 → latest slot end Tue 16:30.
    const r = run(
      [
        { id: "A", durationDays: 2 },
        { id: "B", durationDays: 0.5 },
      ],
      [{ from: "A", to: "B", kind: "FF", lag: 1, lagUnit: "elapsedHours" }],
    );
    expect(dates(r, "B")).toEqual(["2026-03-04T08:00", "2026-03-04T12:00"]);
    expect(task(r, "A").lateFinish).toBe("2026-03-03T16:30");
    expect(task(r, "A").totalFloatDays).toBe(0);
  });

  it("working-day lags snap on the successor's calendar (a Saturday finish snaps to Monday 08:00)", () => {
    const cals: CalendarInput[] = [
      WORKSHOP,
      { id: "sat", workingWeekdays: [1, 2, 3, 4, 5, 6], dayEnd: "17:00" },
    ];
    const r = run(
      [
        {
          id: "S",
          calendar: "sat",
          durationDays: 1,
          notEarlierThan: "2026-03-07",
        },
        { id: "B0", durationDays: 0.5 },
        { id: "Bhalf", durationDays: 0.5 },
        {
          id: "L",
          calendar: "sat",
          durationDays: 0.5,
          notEarlierThan: "2026-03-02T12:00",
        },
        { id: "C", durationDays: 0.5 },
      ],
      [
        // Sat 7 17:00 → Mon 9 08:00 (+0) and Mon 9 12:00 (+0.5).
        { from: "S", to: "B0" },
        { from: "S", to: "Bhalf", lag: 0.5 },
        // Mon 2 17:00 on the 17:00 calendar is after the workshop's 16:30 end → Tue 08:00.
        { from: "L", to: "C" },
      ],
      { calendars: cals },
    );
    expect(task(r, "S").earlyFinish).toBe("2026-03-07T17:00");
    expect(task(r, "B0").earlyStart).toBe("2026-03-09T08:00");
    expect(task(r, "Bhalf").earlyStart).toBe("2026-03-09T12:00");
    expect(task(r, "C").earlyStart).toBe("2026-03-03T08:00");
  });
});

describe("durations, milestones, data date", () => {
  it("half-day durations count slots: 1.5 days from Mon 12:00 ends Tue 16:30", () => {
    const r = run([
      { id: "A", durationDays: 1.5, notEarlierThan: "2026-03-02T12:00" },
    ]);
    expect(dates(r, "A")).toEqual(["2026-03-02T12:00", "2026-03-03T16:30"]);
  });

  it("a milestone sits at the instant its links allow (Fri 16:30), its late instant Mon 08:00", () => {
    // A Fri 6; M FS 0 → Fri 16:30; B after M → Mon 9 08:00, the programme's last task.
    const r = run(
      [
        { id: "A", durationDays: 1, notEarlierThan: "2026-03-06" },
        { id: "M", durationDays: 0 },
        { id: "B", durationDays: 1 },
      ],
      [
        { from: "A", to: "M" },
        { from: "M", to: "B" },
      ],
    );
    const m = task(r, "M");
    expect([m.earlyStart, m.earlyFinish, m.lateStart, m.lateFinish]).toEqual([
      "2026-03-06T16:30",
      "2026-03-06T16:30",
      "2026-03-09T08:00",
      "2026-03-09T08:00",
    ]);
    // No working slot lies between Fri 16:30 and Mon 08:00: float 0, on the driving path.
    expect(m.totalFloatDays).toBe(0);
    expect(dates(r, "B")).toEqual(["2026-03-09T08:00", "2026-03-09T16:30"]);
    expect(r.criticalPath).toEqual(["A", "M", "B"]);
  });

  it("a data date on a non-working day means the next working slot", () => {
    const r = run([{ id: "A", durationDays: 1 }], [], {
      dataDate: "2026-03-07",
    });
    expect(dates(r, "A")).toEqual(["2026-03-09T08:00", "2026-03-09T16:30"]);
  });
});

describe("actual dates", () => {
  it("date-only actuals: start = that morning, finish = that day end; done, successors follow", () => {
    const r = run(
      [
        {
          id: "A",
          durationDays: 2,
          actualStart: "2026-02-26",
          actualFinish: "2026-02-27",
        },
        { id: "B", durationDays: 1 },
      ],
      [{ from: "A", to: "B" }],
    );
    const a = task(r, "A");
    expect([a.plannedStart, a.plannedFinish, a.readiness.state]).toEqual([
      "2026-02-26T08:00",
      "2026-02-27T16:30",
      "done",
    ]);
    // A finished before the data date, so B is clear and starts on the data date.
    expect(task(r, "B").readiness).toEqual({ state: "clear", waitingOn: [] });
    expect(dates(r, "B")).toEqual(["2026-03-02T08:00", "2026-03-02T16:30"]);
  });

  it("a slot actual start: started Mon 12:00, 1 day → planned finish Tue 12:00, not overdue", () => {
    const r = run(
      [
        { id: "A", durationDays: 1, actualStart: "2026-03-02T12:00" },
        { id: "B", durationDays: 0.5 },
      ],
      [{ from: "A", to: "B" }],
    );
    const a = task(r, "A");
    expect([
      a.plannedStart,
      a.plannedFinish,
      a.readiness.state,
      a.problems,
    ]).toEqual(["2026-03-02T12:00", "2026-03-03T12:00", "started", []]);
    expect(task(r, "B").earlyStart).toBe("2026-03-03T12:00");
  });

  it("started-but-overdue work finishes no earlier than the end of the data date first slot", () => {
    // Started Mon 2, 1 day → due Mon 16:30, which is before the data date's first slot (Wed 4
    // 08:00): overdue, and now planned to finish at the end of Wed morning.
    const r = run(
      [
        {
          id: "A",
          name: "Fit plinths",
          durationDays: 1,
          actualStart: "2026-03-02",
        },
      ],
      [],
      { dataDate: "2026-03-04" },
    );
    const a = task(r, "A");
    expect(a.plannedFinish).toBe("2026-03-04T12:00");
    expect(a.problems).toEqual([
      {
        code: "overdue",
        message:
          "Fit plinths was due to finish by Mon 2 Mar and is not marked done",
      },
    ]);
  });
});

describe("pins", () => {
  it("a booking earlier than the links allow stays put and raises booking-too-early", () => {
    // A Mon–Tue; B booked Tue 3 morning but A allows Wed 08:00. C follows B's booked dates
    // (Tue 08:00–16:30 → Wed 08:00).
    const r = run(
      [
        { id: "A", name: "Fix carcasses", durationDays: 2 },
        {
          id: "B",
          name: "Template coving",
          durationDays: 1,
          bookedStart: "2026-03-03",
        },
        { id: "C", durationDays: 1 },
      ],
      [
        { from: "A", to: "B" },
        { from: "B", to: "C" },
      ],
    );
    const b = task(r, "B");
    expect([b.earlyStart, b.plannedStart, b.plannedFinish]).toEqual([
      "2026-03-04T08:00",
      "2026-03-03T08:00",
      "2026-03-03T16:30",
    ]);
    expect(b.problems[0]).toEqual({
      code: "booking-too-early",
      message:
        "Booked for Tue 3 Mar morning, but Fix carcasses allows a start only from Wed 4 Mar morning",
    });
    expect(dates(r, "C")).toEqual(["2026-03-04T08:00", "2026-03-04T16:30"]);
    // The programme finishes with C (Wed 16:30), so B's late start is Tue 08:00 and its float,
    // late start − booked start, is 0. A's late finish is capped by the booked start: Tue 08:00
    // → Mon 16:30, two slots before its early finish, so A has −1 day of float.
    expect(b.totalFloatDays).toBe(0);
    expect(task(r, "A").lateFinish).toBe("2026-03-02T16:30");
    expect(task(r, "A").totalFloatDays).toBe(-1);
    expect(task(r, "A").problems.map((p) => p.code)).toEqual([
      "handover-at-risk",
    ]);
  });

  it("a later booking keeps its dates; its float is late start − booked start", () => {
    // A Mon; B booked Wed 4; handover end of Fri 6 → B late start Fri 08:00: float 2 days.
    const r = run(
      [
        { id: "A", durationDays: 1 },
        { id: "B", durationDays: 1, bookedStart: "2026-03-04T08:00" },
      ],
      [{ from: "A", to: "B" }],
      { handover: "2026-03-06" },
    );
    const b = task(r, "B");
    expect([
      b.earlyStart,
      b.plannedStart,
      b.lateStart,
      b.totalFloatDays,
    ]).toEqual(["2026-03-03T08:00", "2026-03-04T08:00", "2026-03-06T08:00", 2]);
    expect(b.problems).toEqual([]);
    // A's late finish is capped by the booked start: Wed 08:00 → Tue 16:30; float 1 day.
    expect(task(r, "A").totalFloatDays).toBe(1);
  });

  it("a booking on a non-working day raises non-working-day", () => {
    const r = run([{ id: "A", durationDays: 1, bookedStart: "2026-03-07" }]);
    expect(task(r, "A").problems).toContainEqual({
      code: "non-working-day",
      message:
        "Booked start Sat 7 Mar is not a working day on this task's calendar",
    });
  });
});

describe("clashes", () => {
  it("against busy intervals: whole day, not a weekend job, and against another task", () => {
    const r = run(
      [
        {
          id: "A",
          name: "Coving",
          durationDays: 2,
          resource: "plasterer-1",
          notEarlierThan: "2026-03-05",
        },
        {
          id: "B",
          name: "Make good",
          durationDays: 1,
          resource: "plasterer-1",
          notEarlierThan: "2026-03-06",
        },
        { id: "C", durationDays: 1, resource: "plasterer-2" },
      ],
      [],
      {
        busy: [
          // A runs Thu 5–Fri 6: the Friday booking clashes, the Saturday one is outside its working time.
          {
            resource: "plasterer-1",
            start: "2026-03-06",
            finish: "2026-03-06",
            ref: "job 9",
          },
          {
            resource: "plasterer-1",
            start: "2026-03-07T08:00",
            finish: "2026-03-07T16:30",
            ref: "job 10",
          },
          // Another trade's booking does not matter.
          {
            resource: "decorator-1",
            start: "2026-03-02T08:00",
            finish: "2026-03-02T16:30",
            ref: "job 11",
          },
        ],
      },
    );
    expect(task(r, "A").problems).toEqual([
      {
        code: "clash",
        message: "Plasterer-1 is already booked Fri 6 Mar (job 9)",
      },
      {
        code: "clash",
        message: "Plasterer-1 is already booked Fri 6 Mar (Make good)",
      },
    ]);
    expect(task(r, "B").problems).toEqual([
      {
        code: "clash",
        message:
          "Plasterer-1 is already booked Thu 5 Mar to Fri 6 Mar (Coving)",
      },
      {
        code: "clash",
        message: "Plasterer-1 is already booked Fri 6 Mar (job 9)",
      },
    ]);
    expect(task(r, "C").problems).toEqual([]);
  });

  it("an afternoon busy interval next to a morning task is no clash (intervals touch only)", () => {
    const r = run([{ id: "A", durationDays: 0.5, resource: "p" }], [], {
      busy: [
        {
          resource: "p",
          start: "2026-03-02T12:00",
          finish: "2026-03-02T16:30",
          ref: "x",
        },
      ],
    });
    expect(task(r, "A").problems).toEqual([]);
  });
});

describe("calendar intersection", () => {
  it("intersects days and hours: latest start, earliest end, every day off", () => {
    // Trade Mon–Sat 07:30–17:00; site Mon–Fri 08:00–16:00 with Wed 4 off (customer away).
    // 2 days from Tue 3: Tue, (Wed off) Thu → Thu 16:00.
    const r = run(
      [
        {
          id: "A",
          calendar: ["trade", "site"],
          durationDays: 2,
          notEarlierThan: "2026-03-03",
        },
      ],
      [],
      {
        calendars: [
          WORKSHOP,
          {
            id: "trade",
            workingWeekdays: [1, 2, 3, 4, 5, 6],
            dayStart: "07:30",
            dayEnd: "17:00",
          },
          {
            id: "site",
            dayStart: "08:00",
            dayEnd: "16:00",
            daysOff: ["2026-03-04"],
          },
        ],
      },
    );
    expect(dates(r, "A")).toEqual(["2026-03-03T08:00", "2026-03-05T16:00"]);
  });
});

describe("more link and calendar cases", () => {
  it("SS with an elapsed-hour lag: 5 h after a Mon 08:00 start is 13:00 → Tue 08:00", () => {
    // Mon 08:00 + 5 h = 13:00, inside the afternoon slot; the first slot starting at or after
    // it is Tue 08:00. With 4 h it is exactly 12:00, so Mon 12:00.
    const r = run(
      [
        { id: "A", durationDays: 3 },
        { id: "B5", durationDays: 0.5 },
        { id: "B4", durationDays: 0.5 },
      ],
      [
        { from: "A", to: "B5", kind: "SS", lag: 5, lagUnit: "elapsedHours" },
        { from: "A", to: "B4", kind: "SS", lag: 4, lagUnit: "elapsedHours" },
      ],
    );
    expect(task(r, "B5").earlyStart).toBe("2026-03-03T08:00");
    expect(task(r, "B4").earlyStart).toBe("2026-03-02T12:00");
  });

  it("the site's nation sets the bank holidays of a trade without one (Scotland, Mon 15 Jun 2026)", () => {
    // Trade calendar with no region ∩ a Scottish site: 2 days from Fri 12 Jun skip the weekend
    // and the one-off holiday Mon 15 Jun (GOV.UK, references §3) → Fri 12, Tue 16.
    const r = run(
      [{ id: "A", calendar: ["trade", "site"], durationDays: 2 }],
      [],
      {
        dataDate: "2026-06-12",
        calendars: [
          WORKSHOP,
          { id: "trade", holidayRegion: null },
          { id: "site", holidayRegion: "GB-SCT" },
        ],
      },
    );
    expect(dates(r, "A")).toEqual(["2026-06-12T08:00", "2026-06-16T16:30"]);
  });
});

describe("float, handover and readiness", () => {
  it("handover slip, negative float and free float never above total float", () => {
    // A 3 days Mon–Wed, B 2 days Thu–Fri; handover end of Wed 4 → 2 days slip.
    const r = run(
      [
        { id: "A", durationDays: 3 },
        { id: "B", name: "Hang doors", durationDays: 2 },
      ],
      [{ from: "A", to: "B" }],
      { handover: "2026-03-04" },
    );
    expect(r.handoverSlipDays).toBe(2);
    expect(r.finish).toBe("2026-03-06T16:30");
    const a = task(r, "A");
    const b = task(r, "B");
    expect([
      a.totalFloatDays,
      a.freeFloatDays,
      b.totalFloatDays,
      b.freeFloatDays,
    ]).toEqual([-2, -2, -2, -2]);
    expect(b.problems).toEqual([
      {
        code: "handover-at-risk",
        message:
          "Hang doors is 2 working days behind what handover on Wed 4 Mar allows",
      },
    ]);
    expect(a.critical && b.critical).toBe(true);
  });

  it("waitingOn lists each predecessor once, sorted by allowsFrom then id", () => {
    // P (1 day) allows Tue 08:00; Q and R (2 days) allow Wed 08:00; a second link from Q with
    // lag 0.5 allows Wed 12:00, so Q is listed at Wed 12:00, after R.
    const r = run(
      [
        { id: "R", durationDays: 2 },
        { id: "Q", durationDays: 2 },
        { id: "P", durationDays: 1 },
        { id: "X", durationDays: 1 },
      ],
      [
        { from: "Q", to: "X" },
        { from: "P", to: "X" },
        { from: "R", to: "X" },
        { from: "Q", to: "X", lag: 0.5 },
      ],
    );
    expect(task(r, "X").readiness).toEqual({
      state: "waiting",
      waitingOn: [
        { task: "P", allowsFrom: "2026-03-03T08:00" },
        { task: "R", allowsFrom: "2026-03-04T08:00" },
        { task: "Q", allowsFrom: "2026-03-04T12:00" },
      ],
    });
    expect(r.criticalPath).toEqual(["Q", "X"]);
  });

  it("the driving path exists when nothing is critical, ties broken by id", () => {
    // A and B identical (1 day) both drive C; handover a week later; path picks A (id order).
    const r = run(
      [
        { id: "B", durationDays: 1 },
        { id: "A", durationDays: 1 },
        { id: "C", durationDays: 1 },
      ],
      [
        { from: "B", to: "C" },
        { from: "A", to: "C" },
      ],
      { handover: "2026-03-13" },
    );
    expect(r.tasks.some((t) => t.critical)).toBe(false);
    expect(r.criticalPath).toEqual(["A", "C"]);
    expect(r.handoverSlipDays).toBe(0);
  });
});

describe("invalid input", () => {
  it("rejects a loop naming the tasks in it", () => {
    const go = () =>
      run(
        [
          { id: "a", durationDays: 1 },
          { id: "b", durationDays: 1 },
          { id: "c", durationDays: 1 },
          { id: "d", durationDays: 1 },
        ],
        [
          { from: "d", to: "a" },
          { from: "a", to: "b" },
          { from: "b", to: "c" },
          { from: "c", to: "a" },
        ],
      );
    expect(go).toThrow(ProgrammeInputError);
    try {
      go();
    } catch (e) {
      expect((e as ProgrammeInputError).problems).toEqual([
        "Links form a loop: a → b → c → a",
      ]);
    }
  });
});
