// `npm run bench`: time scheduleProgramme on portfolios of 100, 1,000 and 10,000 tasks (about
// 1.5 links per task; mixed calendars, link kinds and lag units) against a bare topological sort
// of the same graph in the same process, plus a 40-task drag-preview re-schedule (issue 3,
// spec "Speed"). Prints one JSON array on stdout and nothing else.
import { performance } from "node:perf_hooks";
import { scheduleProgramme } from "../../shared/programme/index";
import { randomPortfolio } from "../../shared/programme/fixtures/random-portfolio";
import { prepare } from "../../shared/programme/prepare";
import { compute, present } from "../../shared/programme/schedule";
import type { ProgrammeInput } from "../../shared/programme/types";

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

function time(fn: () => unknown, warmup: number, runs: number): number {
  for (let i = 0; i < warmup; i++) fn();
  const xs: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    xs.push(performance.now() - t0);
  }
  return median(xs);
}

/** The baseline: Kahn's topological sort of the same input, ids resolved the same way. */
function topoSort(input: ProgrammeInput): Int32Array {
  const n = input.tasks.length;
  const index = new Map<string, number>();
  for (let i = 0; i < n; i++) index.set(input.tasks[i].id, i);
  const links = input.links ?? [];
  const m = links.length;
  const from = new Int32Array(m);
  const to = new Int32Array(m);
  const start = new Int32Array(n + 1);
  const indeg = new Int32Array(n);
  for (let e = 0; e < m; e++) {
    from[e] = index.get(links[e].from)!;
    to[e] = index.get(links[e].to)!;
    start[from[e] + 1]++;
    indeg[to[e]]++;
  }
  for (let i = 0; i < n; i++) start[i + 1] += start[i];
  const fill = start.slice(0, n);
  const adj = new Int32Array(m);
  for (let e = 0; e < m; e++) adj[fill[from[e]]++] = to[e];
  const order = new Int32Array(n);
  let head = 0;
  let tail = 0;
  for (let i = 0; i < n; i++) if (indeg[i] === 0) order[tail++] = i;
  while (head < tail) {
    const i = order[head++];
    for (let k = start[i]; k < start[i + 1]; k++)
      if (--indeg[adj[k]] === 0) order[tail++] = adj[k];
  }
  if (tail !== n) throw new Error("loop");
  return order;
}

const round = (x: number) => Math.round(x * 1000) / 1000;
const out: Record<string, unknown>[] = [];

for (const size of [100, 1000, 10000]) {
  const input = randomPortfolio(size, 42);
  const runs = size >= 10000 ? 41 : size >= 1000 ? 101 : 301;
  const warm = size >= 10000 ? 10 : 50;
  // Interleave so both see the same machine state; each is a median of its own runs.
  const baseline = time(() => topoSort(input), warm, runs);
  const engine = time(() => scheduleProgramme(input), warm, runs);
  const baseline2 = time(() => topoSort(input), warm, runs);
  const base = Math.min(baseline, baseline2);
  // Where the time goes, for the 10,000-task figure: checking and flattening the input, the
  // passes themselves, and writing the result objects and messages.
  let phases: Record<string, number> | undefined;
  if (size === 10000) {
    const p = prepare(input);
    const c = compute(p);
    phases = {
      prepareMs: round(time(() => prepare(input), 5, 21)),
      passesMs: round(time(() => compute(p), 5, 21)),
      presentMs: round(time(() => present(c), 5, 21)),
    };
  }
  out.push({
    scenario: "portfolio",
    tasks: input.tasks.length,
    links: input.links!.length,
    medianMs: round(engine),
    baselineMedianMs: round(base),
    ratio: round(engine / base),
    runs,
    ...(phases ? { phases, targetMs: 100, targetRatio: 4 } : {}),
  });
}

// Drag preview: a 40-task job re-scheduled after moving one task's not-earlier-than date.
{
  const job = randomPortfolio(40, 7);
  let day = 0;
  const drag = () => {
    day = (day + 1) % 20;
    const tasks = job.tasks.map((t, i) =>
      i === 5
        ? {
            ...t,
            notEarlierThan: `2026-03-${String(3 + day).padStart(2, "0")}`,
          }
        : t,
    );
    return scheduleProgramme({ ...job, tasks });
  };
  const ms = time(drag, 200, 1001);
  out.push({
    scenario: "reschedule",
    tasks: 40,
    links: job.links!.length,
    medianMs: round(ms),
    targetMs: 2,
    runs: 1001,
  });
}

process.stdout.write(JSON.stringify(out, null, 2) + "\n");
