import { describe, expect, it } from "vitest";
import { scheduleProgramme } from "../programme";
import type { ProgrammeResponse, ProgrammeTask } from "./programme";
import {
  applyProgrammeEdit,
  engineInputOf,
  programmeAfterEdit,
  programmeEditOf,
} from "./programme-view";

// A small job in the response's shape; its result is the engine's on the rebuilt input, as the
// server's is on the input it built.
const calendars: ProgrammeResponse["engine"]["calendars"] = [
  {
    id: "workshop",
    workingWeekdays: [1, 2, 3, 4, 5],
    dayStart: "08:00",
    dayEnd: "16:30",
    holidayRegion: "GB-ENG",
    daysOff: [],
  },
  {
    id: "site",
    workingWeekdays: [1, 2, 3, 4, 5],
    dayStart: "08:00",
    dayEnd: "16:30",
    holidayRegion: "GB-ENG",
    daysOff: [],
  },
  {
    id: "trade:t-plaster",
    workingWeekdays: [1, 2, 3, 4, 5, 6],
    dayStart: "07:30",
    dayEnd: "16:00",
    holidayRegion: "GB-ENG",
    daysOff: ["2026-03-20"],
  },
];

function task(
  id: string,
  sortOrder: number,
  o: Partial<ProgrammeTask> = {},
): ProgrammeTask {
  return {
    id,
    name: `Task ${id}`,
    party: "workshop",
    durationDays: 1,
    sortOrder,
    notEarlierThan: null,
    actualStart: null,
    actualFinish: null,
    customerNote: "",
    internalNote: "",
    hazards: [],
    booking: null,
    ...o,
  };
}

const link = (id: string, from: string, to: string, lag = 0) => ({
  id,
  fromTaskId: from,
  toTaskId: to,
  kind: "FS" as const,
  lag,
  lagUnit: "workingDays" as const,
});

function programme(
  p: Omit<ProgrammeResponse, "result" | "jobId" | "timeZone" | "dataDate"> &
    Partial<ProgrammeResponse>,
): ProgrammeResponse {
  const base = {
    jobId: "job-1",
    timeZone: "Europe/London",
    dataDate: "2026-03-02",
    ...p,
  };
  const withResult = {
    ...base,
    result: {
      finish: null,
      handoverSlipDays: null,
      criticalPath: [],
      tasks: [],
    },
  };
  return {
    ...withResult,
    result: scheduleProgramme(engineInputOf(withResult)),
  };
}

const before = programme({
  version: 4,
  handover: "2026-03-13",
  tasks: [
    task("a", 1, { actualStart: "2026-03-02" }),
    task("b", 2, {
      party: "plasterer",
      durationDays: 1,
      booking: {
        id: "bk-1",
        tradeId: "t-plaster",
        tradeName: "Ashby Plaster & Coving",
        state: "confirmed",
        start: "2026-03-05T08:00",
        finish: "2026-03-05T16:00",
      },
    }),
    task("c", 3, { party: "decorator" }),
    task("d", 4),
    task("e", 5, { notEarlierThan: "2026-03-10" }),
  ],
  links: [link("ab", "a", "b"), link("bc", "b", "c", 1), link("cd", "c", "d")],
  engine: {
    calendars,
    busy: [
      {
        resource: "Ashby Plaster & Coving",
        start: "2026-03-09T07:30",
        finish: "2026-03-09T16:00",
        ref: "Bookcase wall, study",
      },
    ],
    resources: { "t-plaster": "Ashby Plaster & Coving" },
  },
});

/** `before` with its tasks and links changed, scheduled again at the next version. */
function edited(
  tasks: ProgrammeTask[],
  links = before.links,
  engine = before.engine,
): ProgrammeResponse {
  return programme({
    version: before.version + 1,
    handover: before.handover,
    tasks,
    links,
    engine,
  });
}

describe("engineInputOf", () => {
  it("rebuilds each task's calendars, resource and pin by the one rule", () => {
    const input = engineInputOf(before);
    expect(input.tasks).toEqual([
      {
        id: "a",
        name: "Task a",
        calendar: ["workshop", "site"],
        durationDays: 1,
        resource: null,
        notEarlierThan: null,
        bookedStart: null,
        actualStart: "2026-03-02",
        actualFinish: null,
      },
      {
        id: "b",
        name: "Task b",
        calendar: ["trade:t-plaster", "site"],
        durationDays: 1,
        resource: "Ashby Plaster & Coving",
        notEarlierThan: null,
        bookedStart: "2026-03-05T08:00",
        actualStart: null,
        actualFinish: null,
      },
      expect.objectContaining({ id: "c", calendar: ["site"], resource: null }),
      expect.objectContaining({ id: "d", calendar: ["workshop", "site"] }),
      expect.objectContaining({ id: "e", notEarlierThan: "2026-03-10" }),
    ]);
    expect(input.links).toEqual([
      { from: "a", to: "b", kind: "FS", lag: 0, lagUnit: "workingDays" },
      { from: "b", to: "c", kind: "FS", lag: 1, lagUnit: "workingDays" },
      { from: "c", to: "d", kind: "FS", lag: 0, lagUnit: "workingDays" },
    ]);
    expect(input.calendars).toBe(before.engine.calendars);
    expect(input.busy).toBe(before.engine.busy);
    expect([input.timeZone, input.dataDate, input.handover]).toEqual([
      "Europe/London",
      "2026-03-02",
      "2026-03-13",
    ]);
  });

  it("drops the pin once a booked task has started", () => {
    const started = { ...before.tasks[1], actualStart: "2026-03-04" };
    const input = engineInputOf({
      ...before,
      tasks: [before.tasks[0], started],
      links: [],
    });
    expect(input.tasks[1]).toMatchObject({
      bookedStart: null,
      actualStart: "2026-03-04",
      resource: "Ashby Plaster & Coving",
    });
  });
});

describe("programmeEditOf and applyProgrammeEdit", () => {
  const roundTrip = (after: ProgrammeResponse) => {
    const edit = programmeEditOf(before, after);
    // Through JSON, as it travels.
    const sent = JSON.parse(JSON.stringify(edit)) as typeof edit;
    expect(applyProgrammeEdit(before, sent)).toEqual(after);
    return edit;
  };

  it("a longer task answers with that task and the results that moved, nothing else", () => {
    const c = { ...before.tasks[2], durationDays: 3 };
    const after = edited(before.tasks.map((t) => (t.id === "c" ? c : t)));
    const edit = roundTrip(after);
    expect(edit.version).toBe(5);
    expect(edit.tasks).toEqual([c]);
    expect(edit.removedTaskIds).toEqual([]);
    expect(edit.links).toEqual([]);
    expect(edit.engine).toBeUndefined();
    expect(edit.taskOrder).toBeUndefined();
    // c finishes two days later, so d (waiting for it) moves too; b keeps its dates but has
    // less float before handover; a (started) and e (not linked) are untouched.
    const moved = edit.result.tasks.map((r) => r.id);
    expect(moved).toEqual(["b", "c", "d"]);
    const floatOf = (p: ProgrammeResponse, id: string) =>
      p.result.tasks.find((r) => r.id === id)!.totalFloatDays;
    expect(floatOf(after, "b")).toBe(floatOf(before, "b") - 2);
    const d = after.result.tasks.find((r) => r.id === "d")!;
    expect(d.plannedStart > before.result.tasks[3].plannedStart).toBe(true);
    expect(edit.result.tasks[2]).toEqual(d);
    expect(edit.result.finish).toBe(after.result.finish);
    expect(edit.result.handoverSlipDays).toBe(after.result.handoverSlipDays);
  });

  it("a new task comes at the end; a removed one takes its links and result with it", () => {
    const added = roundTrip(edited([...before.tasks, task("f", 6)]));
    expect(added.tasks.map((t) => t.id)).toEqual(["f"]);
    expect(added.result.tasks.map((r) => r.id)).toContain("f");

    const removed = roundTrip(
      edited(
        before.tasks.filter((t) => t.id !== "c"),
        before.links.filter((l) => l.fromTaskId !== "c" && l.toTaskId !== "c"),
      ),
    );
    expect(removed.removedTaskIds).toEqual(["c"]);
    expect(removed.removedLinkIds).toEqual(["bc", "cd"]);
  });

  it("a reorder sends the tasks whose place changed, and the merge sorts them", () => {
    const order = ["e", "a", "b", "c", "d"];
    const after = edited(
      order.map((id, i) => ({
        ...before.tasks.find((t) => t.id === id)!,
        sortOrder: i + 1,
      })),
    );
    const edit = roundTrip(after);
    expect(edit.tasks.map((t) => t.id).sort()).toEqual(order.slice().sort());
    expect(edit.taskOrder).toBeUndefined();
  });

  it("says the order outright when the sort order alone would not give it (equal sort orders)", () => {
    const tasks = before.tasks.map((t) => ({ ...t, sortOrder: 1 }));
    const tied = programme({ ...before, tasks });
    const after = programme({
      ...before,
      version: before.version + 1,
      tasks: [tasks[4], ...tasks.slice(0, 4)],
    });
    const edit = programmeEditOf(tied, after);
    expect(edit.taskOrder).toEqual(["e", "a", "b", "c", "d"]);
    expect(applyProgrammeEdit(tied, edit)).toEqual(after);
  });

  it("a link added in the middle of the server's list keeps the server's order", () => {
    const links = [
      before.links[0],
      link("ae", "a", "e"),
      ...before.links.slice(1),
    ];
    const edit = roundTrip(edited(before.tasks, links));
    expect(edit.links.map((l) => l.id)).toEqual(["ae"]);
    expect(edit.linkOrder).toEqual(["ab", "ae", "bc", "cd"]);
  });

  it("sends the engine's part only when it changed", () => {
    const engine = {
      ...before.engine,
      busy: [],
    };
    const edit = roundTrip(edited(before.tasks, before.links, engine));
    expect(edit.engine).toEqual(engine);
  });
});

describe("programmeAfterEdit", () => {
  const after = edited(
    before.tasks.map((t) => (t.id === "d" ? { ...t, durationDays: 2 } : t)),
  );
  const edit = programmeEditOf(before, after);

  it("lays the next version over the cached one", () => {
    expect(programmeAfterEdit(before, edit)).toEqual(after);
  });

  it("gives nothing (read it again) when a version was missed, or for another job or no cache", () => {
    expect(programmeAfterEdit(before, { ...edit, version: 6 })).toBeNull();
    expect(programmeAfterEdit({ ...before, version: 3 }, edit)).toBeNull();
    expect(programmeAfterEdit({ ...before, jobId: "job-2" }, edit)).toBeNull();
    expect(programmeAfterEdit(undefined, edit)).toBeNull();
  });
});
