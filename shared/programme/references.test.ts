// Published critical-path worked examples (references §1), through scheduleProgramme and through
// the CLI. Day numbers map to dates with day 0 = Mon 2 Mar 2026 on a calendar that works all
// seven days with no holidays (references §1: "Map day 0 to a Monday…"); a published ES of day
// n is that day's 08:00, a published EF of day n is the end (16:30) of day n − 1.
import { beforeAll, describe, expect, it } from "vitest";
import { scheduleProgramme } from "./schedule";
import {
  finishAtDay,
  publishedInput,
  runCliMany,
  startOfDay,
  task,
  type PublishedActivity,
} from "./test-helpers";
import type { ProgrammeResult } from "./types";

type Row = {
  id: string;
  es: number;
  ef: number;
  ls?: number;
  lf?: number;
  tf?: number;
  ff?: number;
};

function checkRows(r: ProgrammeResult, rows: Row[]) {
  for (const row of rows) {
    const t = task(r, row.id);
    expect({ id: row.id, es: t.earlyStart, ef: t.earlyFinish }).toEqual({
      id: row.id,
      es: startOfDay(row.es),
      ef: finishAtDay(row.ef),
    });
    if (row.ls !== undefined)
      expect([row.id, t.lateStart]).toEqual([row.id, startOfDay(row.ls)]);
    if (row.lf !== undefined)
      expect([row.id, t.lateFinish]).toEqual([row.id, finishAtDay(row.lf)]);
    if (row.tf !== undefined)
      expect([row.id, t.totalFloatDays]).toEqual([row.id, row.tf]);
    if (row.ff !== undefined)
      expect([row.id, t.freeFloatDays]).toEqual([row.id, row.ff]);
  }
}

// Source: "Example 1: Draw the network for the events in Table 1", studylib.net document
// 8378728, Table 2 (references §1.1). Hours in the source; run here as days. Free floats computed.
const ex11: PublishedActivity[] = [
  { id: "A", dur: 6, preds: [] },
  { id: "B", dur: 2, preds: [{ id: "A" }] },
  { id: "C", dur: 2, preds: [{ id: "A" }] },
  { id: "D", dur: 3, preds: [{ id: "B" }] },
  { id: "F", dur: 2, preds: [{ id: "C" }] },
  { id: "E", dur: 4, preds: [{ id: "D" }, { id: "F" }] },
  { id: "G", dur: 1, preds: [{ id: "E" }] },
];
const ex11Rows: Row[] = [
  { id: "A", es: 0, ef: 6, ls: 0, lf: 6, tf: 0, ff: 0 },
  { id: "B", es: 6, ef: 8, ls: 6, lf: 8, tf: 0, ff: 0 },
  { id: "C", es: 6, ef: 8, ls: 7, lf: 9, tf: 1, ff: 0 },
  { id: "D", es: 8, ef: 11, ls: 8, lf: 11, tf: 0, ff: 0 },
  { id: "F", es: 8, ef: 10, ls: 9, lf: 11, tf: 1, ff: 1 },
  { id: "E", es: 11, ef: 15, ls: 11, lf: 15, tf: 0, ff: 0 },
  { id: "G", es: 15, ef: 16, ls: 15, lf: 16, tf: 0, ff: 0 },
];

// Source: C. Hendrickson, Project Management for Construction, ch. 10 "Fundamental Scheduling
// Procedures", Table 10-1 (inputs; duration 30 and critical path A-C-F-I published; the
// ES…FF columns computed, references §1.2).
const ex12: PublishedActivity[] = [
  { id: "A", dur: 4, preds: [] },
  { id: "B", dur: 3, preds: [] },
  { id: "C", dur: 8, preds: [{ id: "A" }] },
  { id: "D", dur: 7, preds: [{ id: "A" }] },
  { id: "E", dur: 9, preds: [{ id: "B" }, { id: "C" }] },
  { id: "F", dur: 12, preds: [{ id: "B" }, { id: "C" }] },
  { id: "G", dur: 2, preds: [{ id: "D" }, { id: "E" }] },
  { id: "H", dur: 5, preds: [{ id: "D" }, { id: "E" }] },
  { id: "I", dur: 6, preds: [{ id: "F" }, { id: "G" }] },
];
const ex12Rows: Row[] = [
  { id: "A", es: 0, ef: 4, ls: 0, lf: 4, tf: 0, ff: 0 },
  { id: "B", es: 0, ef: 3, ls: 9, lf: 12, tf: 9, ff: 9 },
  { id: "C", es: 4, ef: 12, ls: 4, lf: 12, tf: 0, ff: 0 },
  { id: "D", es: 4, ef: 11, ls: 15, lf: 22, tf: 11, ff: 10 },
  { id: "E", es: 12, ef: 21, ls: 13, lf: 22, tf: 1, ff: 0 },
  { id: "F", es: 12, ef: 24, ls: 12, lf: 24, tf: 0, ff: 0 },
  { id: "G", es: 21, ef: 23, ls: 22, lf: 24, tf: 1, ff: 1 },
  { id: "H", es: 21, ef: 26, ls: 25, lf: 30, tf: 4, ff: 4 },
  { id: "I", es: 24, ef: 30, ls: 24, lf: 30, tf: 0, ff: 0 },
];

// Source: R package `criticalpath`, tests/testthat/test-examples.R (published duration 15;
// critical path and C/E figures computed, references §1.3).
const ex13: PublishedActivity[] = [
  { id: "A", dur: 5, preds: [] },
  { id: "B", dur: 4, preds: [{ id: "A" }] },
  { id: "C", dur: 2, preds: [{ id: "A" }] },
  { id: "D", dur: 3, preds: [{ id: "B" }] },
  { id: "E", dur: 4, preds: [{ id: "C" }] },
  { id: "F", dur: 3, preds: [{ id: "D" }, { id: "E" }] },
];
const ex13Rows: Row[] = [
  { id: "C", es: 5, ef: 7, ls: 6, lf: 8, tf: 1, ff: 0 },
  { id: "E", es: 7, ef: 11, ls: 8, lf: 12, tf: 1, ff: 1 },
  { id: "F", es: 12, ef: 15, tf: 0 },
];

// Source: R package `criticalpath`, tests/testthat/test-early_start_finish_by_relation_type.R
// (references §1.4): chain Begin(1) →FS→ A →(kind, lag)→ B →FS→ End(1), ES/EF as published.
// The file's negative SS/FF and SF cases are left out by design (Sitecue clamps to the start).
const ex14: {
  label: string;
  kind: "FS" | "SS" | "FF";
  lag: number;
  durA: number;
  durB: number;
  a: [number, number];
  b: [number, number];
  endEF: number;
}[] = [
  {
    label: "FS +0",
    kind: "FS",
    lag: 0,
    durA: 3,
    durB: 3,
    a: [1, 4],
    b: [4, 7],
    endEF: 8,
  },
  {
    label: "FS +2",
    kind: "FS",
    lag: 2,
    durA: 3,
    durB: 3,
    a: [1, 4],
    b: [6, 9],
    endEF: 10,
  },
  {
    label: "FS −2",
    kind: "FS",
    lag: -2,
    durA: 3,
    durB: 3,
    a: [1, 4],
    b: [2, 5],
    endEF: 6,
  },
  {
    label: "SS +2",
    kind: "SS",
    lag: 2,
    durA: 3,
    durB: 5,
    a: [1, 4],
    b: [3, 8],
    endEF: 9,
  },
  {
    label: "FF +0",
    kind: "FF",
    lag: 0,
    durA: 5,
    durB: 3,
    a: [1, 6],
    b: [3, 6],
    endEF: 7,
  },
  {
    label: "FF +2 (A 3, B 5)",
    kind: "FF",
    lag: 2,
    durA: 3,
    durB: 5,
    a: [1, 4],
    b: [1, 6],
    endEF: 7,
  },
  {
    label: "FF +2 (A 5, B 3)",
    kind: "FF",
    lag: 2,
    durA: 5,
    durB: 3,
    a: [1, 6],
    b: [5, 8],
    endEF: 9,
  },
];
const chain = (c: (typeof ex14)[number]): PublishedActivity[] => [
  { id: "Begin", dur: 1, preds: [] },
  { id: "A", dur: c.durA, preds: [{ id: "Begin" }] },
  { id: "B", dur: c.durB, preds: [{ id: "A", kind: c.kind, lag: c.lag }] },
  { id: "End", dur: 1, preds: [{ id: "B" }] },
];

// Source: course module "Network Construction – Precedence Diagram Method" (2019), references
// §1.5: inputs published, outputs computed. FS with no lag unless noted.
const ex15: PublishedActivity[] = [
  { id: "A", dur: 2, preds: [] },
  { id: "B", dur: 10, preds: [{ id: "A", kind: "SS" }] },
  { id: "C", dur: 13, preds: [{ id: "A" }] },
  { id: "D", dur: 12, preds: [{ id: "A" }] },
  { id: "E", dur: 12, preds: [{ id: "B" }] },
  { id: "F", dur: 7, preds: [{ id: "B" }] },
  { id: "G", dur: 10, preds: [{ id: "D" }] },
  { id: "H", dur: 16, preds: [{ id: "D" }] },
  { id: "I", dur: 6, preds: [{ id: "F" }] },
  { id: "J", dur: 12, preds: [{ id: "C" }, { id: "G", kind: "SS" }] },
  { id: "K", dur: 5, preds: [{ id: "I", kind: "SS" }] },
  { id: "L", dur: 8, preds: [{ id: "E" }, { id: "I" }, { id: "K" }] },
  { id: "M", dur: 5, preds: [{ id: "H" }] },
  {
    id: "N",
    dur: 3,
    preds: [{ id: "G" }, { id: "J" }, { id: "L" }, { id: "M" }],
  },
];
const ex15Tf: Record<string, number> = {
  A: 0,
  D: 0,
  H: 0,
  M: 0,
  N: 0,
  B: 4,
  C: 8,
  E: 5,
  F: 4,
  G: 9,
  I: 4,
  J: 8,
  K: 5,
  L: 4,
};
const ex15Ff: Record<string, number> = { E: 1, G: 1, J: 8, K: 1, L: 4 };

type Runner = (input: ReturnType<typeof publishedInput>) => ProgrammeResult;
const viaFunction: Runner = (input) => scheduleProgramme(input);

// Every input the CLI runs, spawned side by side once; results looked up by the input's JSON.
const allInputs = [ex11, ex12, ex13, ...ex14.map(chain), ex15].map(
  publishedInput,
);
const cliResults = new Map<
  string,
  { status: number | null; stdout: string; stderr: string }
>();
beforeAll(async () => {
  const res = await runCliMany(allInputs);
  allInputs.forEach((input, k) =>
    cliResults.set(JSON.stringify(input), res[k]),
  );
}, 120000);
const viaCli: Runner = (input) => {
  const res = cliResults.get(JSON.stringify(input))!;
  expect(res.stderr).toBe("");
  expect(res.status).toBe(0);
  return JSON.parse(res.stdout) as ProgrammeResult;
};

describe.each([
  ["scheduleProgramme", viaFunction],
  ["the CLI", viaCli],
])("published worked examples through %s", (_label, run) => {
  it("§1.1 studylib 8378728 Table 2: ES/EF/LS/LF/slack, duration 16, critical A-B-D-E-G", () => {
    const r = run(publishedInput(ex11));
    checkRows(r, ex11Rows);
    expect(r.finish).toBe(finishAtDay(16));
    expect(r.criticalPath).toEqual(["A", "B", "D", "E", "G"]);
    expect(
      r.tasks
        .filter((t) => t.critical)
        .map((t) => t.id)
        .sort(),
    ).toEqual(["A", "B", "D", "E", "G"]);
  });

  it("§1.2 Hendrickson Table 10-1: duration 30, critical A-C-F-I, every column", () => {
    const r = run(publishedInput(ex12));
    checkRows(r, ex12Rows);
    expect(r.finish).toBe(finishAtDay(30));
    expect(r.criticalPath).toEqual(["A", "C", "F", "I"]);
  });

  it("§1.3 criticalpath test-examples.R: duration 15, critical A-B-D-F, C and E floats", () => {
    const r = run(publishedInput(ex13));
    checkRows(r, ex13Rows);
    expect(r.finish).toBe(finishAtDay(15));
    expect(r.criticalPath).toEqual(["A", "B", "D", "F"]);
  });

  it.each(ex14)("§1.4 criticalpath relation types: $label", (c) => {
    const r = run(publishedInput(chain(c)));
    checkRows(r, [
      { id: "A", es: c.a[0], ef: c.a[1] },
      { id: "B", es: c.b[0], ef: c.b[1] },
    ]);
    expect(task(r, "End").earlyFinish).toBe(finishAtDay(c.endEF));
  });

  it("§1.5 PDM course module (2019): duration 38, critical A-D-H-M-N, TF and FF", () => {
    const r = run(publishedInput(ex15));
    expect(r.finish).toBe(finishAtDay(38));
    expect(r.criticalPath).toEqual(["A", "D", "H", "M", "N"]);
    const tf = Object.fromEntries(r.tasks.map((t) => [t.id, t.totalFloatDays]));
    expect(tf).toEqual(ex15Tf);
    for (const [id, ff] of Object.entries(ex15Ff))
      expect([id, task(r, id).freeFloatDays]).toEqual([id, ff]);
  });
});
