// Helpers shared by this folder's tests (not part of the engine's public API).
import { spawn, spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { ProgrammeInput, ProgrammeResult, TaskResult } from "./types";

/** Day 0 of the published examples: Mon 2 Mar 2026 (references §1: map day 0 to a Monday). */
export const DAY0 = "2026-03-02";

/** "YYYY-MM-DD" of DAY0 + n calendar days. */
export function dayN(n: number, from = DAY0): string {
  return new Date(Date.parse(from + "T00:00:00Z") + n * 86400000)
    .toISOString()
    .slice(0, 10);
}

/** A start on published day n of a calendar working every day 08:00–16:30. */
export const startOfDay = (n: number) => `${dayN(n)}T08:00`;
/** A finish "at day n" in the published convention (EF = ES + duration): the end of day n − 1. */
export const finishAtDay = (n: number) => `${dayN(n - 1)}T16:30`;

/** A calendar that works all seven days and has no holidays. */
export const EVERY_DAY = {
  id: "workshop",
  workingWeekdays: [1, 2, 3, 4, 5, 6, 7],
  holidayRegion: null,
};

export interface PublishedActivity {
  id: string;
  dur: number;
  preds: { id: string; kind?: "FS" | "SS" | "FF"; lag?: number }[];
}

/** An input for a published network: every activity on the seven-day calendar from DAY0. */
export function publishedInput(acts: PublishedActivity[]): ProgrammeInput {
  return {
    dataDate: DAY0,
    calendars: [EVERY_DAY],
    tasks: acts.map((a) => ({
      id: a.id,
      calendar: "workshop",
      durationDays: a.dur,
    })),
    links: acts.flatMap((a) =>
      a.preds.map((p) => ({
        from: p.id,
        to: a.id,
        kind: p.kind ?? "FS",
        lag: p.lag ?? 0,
        lagUnit: "workingDays" as const,
      })),
    ),
  };
}

/** The task with `id` in a result. */
export function task(r: ProgrammeResult, id: string): TaskResult {
  const t = r.tasks.find((x) => x.id === id);
  if (!t) throw new Error(`no task ${id} in result`);
  return t;
}

/** Run the CLI on an input, as `npm run programme` does (node --import tsx …). */
export function runCli(input: unknown): {
  status: number | null;
  stdout: string;
  stderr: string;
} {
  const dir = mkdtempSync(join(tmpdir(), "programme-cli-"));
  const file = join(dir, "input.json");
  writeFileSync(
    file,
    typeof input === "string" ? input : JSON.stringify(input),
  );
  const res = spawnSync(
    process.execPath,
    ["--import", "tsx", "server/cli/programme-cli.ts", file],
    {
      cwd: join(import.meta.dirname, "..", ".."),
      encoding: "utf8",
      timeout: 60000,
    },
  );
  return { status: res.status, stdout: res.stdout, stderr: res.stderr };
}

/** Run the CLI on many inputs at once (each spawn pays Node's start-up; run them side by side). */
export async function runCliMany(
  inputs: unknown[],
): Promise<{ status: number | null; stdout: string; stderr: string }[]> {
  const dir = mkdtempSync(join(tmpdir(), "programme-cli-"));
  return Promise.all(
    inputs.map((input, k) => {
      const file = join(dir, `input-${k}.json`);
      writeFileSync(
        file,
        typeof input === "string" ? input : JSON.stringify(input),
      );
      return new Promise<{
        status: number | null;
        stdout: string;
        stderr: string;
      }>((resolve) => {
        const child = spawn(
          process.execPath,
          ["--import", "tsx", "server/cli/programme-cli.ts", file],
          {
            cwd: join(import.meta.dirname, "..", ".."),
          },
        );
        let stdout = "";
        let stderr = "";
        child.stdout.on("data", (d) => (stdout += d));
        child.stderr.on("data", (d) => (stderr += d));
        child.on("close", (status) => resolve({ status, stdout, stderr }));
      });
    }),
  );
}
