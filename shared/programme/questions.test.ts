// startWindow, firstFreeStart and impactOf on the spec's worked example (programme-engine.md,
// "The JSON contract"): workshop Mon–Fri 08:00–16:30, Fri 6 Mar 2026 a day off, handover end
// of Tue 10 Mar; fix Tue 3–Wed 4, template (plasterer-1, half a day) from Thu 5 morning; the
// plasterer is busy Thu 5 morning on job 12.
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { firstFreeStart, impactOf, startWindow } from "./questions";
import type { ProgrammeInput } from "./types";

const example = (): ProgrammeInput =>
  JSON.parse(
    readFileSync(
      join(import.meta.dirname, "fixtures", "spec-example.json"),
      "utf8",
    ),
  );

describe("startWindow", () => {
  it("lists every slot start from early to late start, skipping the day off", () => {
    expect(startWindow(example(), "template")).toEqual({
      task: "template",
      earliestStart: "2026-03-05T08:00",
      latestStart: "2026-03-10T12:00",
      starts: [
        "2026-03-05T08:00",
        "2026-03-05T12:00",
        "2026-03-09T08:00",
        "2026-03-09T12:00",
        "2026-03-10T08:00",
        "2026-03-10T12:00",
      ],
      keepsHandover: true,
    });
  });

  it("is empty when even the early start misses handover", () => {
    const input = { ...example(), handover: "2026-03-04" };
    const w = startWindow(input, "template");
    expect([w.starts, w.keepsHandover]).toEqual([[], false]);
  });
});

describe("firstFreeStart", () => {
  it("skips the busy morning: free from Thu afternoon, within the window", () => {
    expect(firstFreeStart(example(), "template")).toEqual({
      task: "template",
      resource: "plasterer-1",
      start: "2026-03-05T12:00",
      finish: "2026-03-05T16:30",
      lateStart: "2026-03-10T12:00",
      pastLateStart: false,
      message: "Plasterer-1 is free from Thu 5 Mar afternoon",
    });
  });

  it("needs `duration` consecutive free slots (a 1-day task waits for Mon 9)", () => {
    const input = example();
    input.tasks[1].durationDays = 1;
    input.busy = [
      {
        resource: "plasterer-1",
        start: "2026-03-05T12:00",
        finish: "2026-03-05T16:30",
        ref: "job 12",
      },
    ];
    // Thu morning alone is one slot; Thu afternoon is busy, Fri a day off: Mon 9 08:00–16:30.
    const f = firstFreeStart(input, "template")!;
    expect([f.start, f.finish, f.pastLateStart]).toEqual([
      "2026-03-09T08:00",
      "2026-03-09T16:30",
      false,
    ]);
  });

  it("may lie past the late start, and says so", () => {
    const input = example();
    input.busy = [
      {
        resource: "plasterer-1",
        start: "2026-03-05",
        finish: "2026-03-10",
        ref: "job 12",
      },
    ];
    const f = firstFreeStart(input, "template")!;
    expect(f.start).toBe("2026-03-11T08:00");
    expect(f.pastLateStart).toBe(true);
    expect(f.message).toBe(
      "Plasterer-1 is first free Wed 11 Mar morning, after the latest start that keeps handover (Tue 10 Mar afternoon)",
    );
  });

  it("counts the resource's other tasks in the same input as busy, and honours `after`", () => {
    const input = example();
    input.busy = [];
    input.tasks.push({
      id: "other",
      durationDays: 1,
      resource: "plasterer-1",
      bookedStart: "2026-03-09",
    });
    const f = firstFreeStart(input, "template", { after: "2026-03-09" })!;
    expect(f.start).toBe("2026-03-10T08:00");
  });
});

describe("impactOf", () => {
  it("a slip of the fix: it moves 1 day, the booked template must be re-confirmed", () => {
    const before = example();
    before.tasks[1].bookedStart = "2026-03-05";
    const after = example();
    after.tasks[1].bookedStart = "2026-03-05";
    after.tasks[0].notEarlierThan = "2026-03-04"; // the delivery comes a day late
    const impact = impactOf(before, after);
    // fix Tue 3–Wed 4 → Wed 4–Thu 5; template's booking stays, but the fix now allows only Mon 9
    // 08:00 (Fri 6 is a day off), when the plasterer is free. The finish moves from the end of
    // the template (Thu 12:00) to the end of the fix (Thu 16:30): half a working day.
    expect(impact).toEqual({
      moves: [
        {
          task: "fix",
          fromStart: "2026-03-03T08:00",
          toStart: "2026-03-04T08:00",
          fromFinish: "2026-03-04T16:30",
          toFinish: "2026-03-05T16:30",
          byDays: 1,
        },
      ],
      reconfirm: [
        {
          task: "template",
          bookedStart: "2026-03-05T08:00",
          proposedStart: "2026-03-09T08:00",
          reason:
            "The work it waits for now allows a start only from Mon 9 Mar morning",
        },
      ],
      handover: {
        finishBefore: "2026-03-05T12:00",
        finishAfter: "2026-03-05T16:30",
        slipDaysBefore: 0,
        slipDaysAfter: 0,
        changeDays: 0.5,
      },
    });
  });

  it("proposes the trade's first free start after the early start when that is busy", () => {
    const before = example();
    before.tasks[1].bookedStart = "2026-03-05";
    const after = structuredClone(before);
    after.tasks[0].notEarlierThan = "2026-03-04";
    after.busy!.push({
      resource: "plasterer-1",
      start: "2026-03-09T08:00",
      finish: "2026-03-09T12:00",
      ref: "job 14",
    });
    expect(impactOf(before, after).reconfirm[0].proposedStart).toBe(
      "2026-03-09T12:00",
    );
  });

  it("an unbooked successor moves with its predecessor, counted in its working days", () => {
    const before = example();
    const after = example();
    after.tasks[0].notEarlierThan = "2026-03-04";
    const impact = impactOf(before, after);
    // template Thu 5 08:00 → Mon 9 08:00: Thu morning and afternoon = 1 working day (Fri off).
    expect(impact.moves.map((m) => [m.task, m.byDays])).toEqual([
      ["fix", 1],
      ["template", 1],
    ]);
    expect(impact.reconfirm).toEqual([]);
    // Finish Thu 12:00 → Mon 12:00: Thu afternoon and Mon morning = 1 working day.
    expect(impact.handover.changeDays).toBe(1);
  });
  it("a moved booking is listed for re-confirming at its new date; nothing else moves", () => {
    const before = example();
    before.tasks[1].bookedStart = "2026-03-05";
    const after = example();
    after.tasks[1].bookedStart = "2026-03-09T12:00";
    const impact = impactOf(before, after);
    expect(impact.reconfirm).toEqual([
      {
        task: "template",
        bookedStart: "2026-03-05T08:00",
        proposedStart: "2026-03-09T12:00",
        reason: "The booking moves to Mon 9 Mar afternoon",
      },
    ]);
    // The template itself moves Thu 08:00 → Mon 12:00: Thu am, Thu pm, Mon am = 1.5 days.
    expect(impact.moves.map((m) => [m.task, m.byDays])).toEqual([
      ["template", 1.5],
    ]);
  });
});

describe("startWindow for a milestone", () => {
  it("lists the boundaries from its early to its late instant", () => {
    // A 1-day task on Mon 2; milestone M after it; handover end of Tue 3: M may sit from Mon
    // 16:30 to Tue 16:30 (the end of the handover day).
    const input: ProgrammeInput = {
      dataDate: "2026-03-02",
      handover: "2026-03-03",
      tasks: [
        { id: "A", durationDays: 1 },
        { id: "M", durationDays: 0 },
      ],
      links: [{ from: "A", to: "M" }],
    };
    const w = startWindow(input, "M");
    expect([w.earliestStart, w.latestStart, w.starts]).toEqual([
      "2026-03-02T16:30",
      "2026-03-03T16:30",
      [
        "2026-03-02T16:30",
        "2026-03-03T08:00",
        "2026-03-03T12:00",
        "2026-03-03T16:30",
      ],
    ]);
  });
});
