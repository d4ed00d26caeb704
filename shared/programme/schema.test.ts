// Input checking: plain-English lines per problem (spec "The JSON contract": invalid input exits
// non-zero with one line per problem), through parseProgrammeInput and through the CLI.
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { parseProgrammeInput } from "./schema";
import { runCliMany } from "./test-helpers";

const fixtures = join(import.meta.dirname, "fixtures");
const example = () =>
  JSON.parse(readFileSync(join(fixtures, "spec-example.json"), "utf8"));

const bad = {
  dataDate: "2026-02-30",
  tasks: [
    { id: "a", durationDays: 0.3 },
    { id: "b", durationDays: 1, calendar: "site" },
  ],
  links: [{ from: "a", to: "c", kind: "FS", lag: 0 }],
};

describe("parseProgrammeInput", () => {
  it("accepts the spec example", () => {
    const r = parseProgrammeInput(example());
    expect(r.ok).toBe(true);
  });

  it("reports each malformed field as a line naming the task", () => {
    const r = parseProgrammeInput(bad);
    expect(r).toEqual({
      ok: false,
      problems: [
        "dataDate must be a date written YYYY-MM-DD",
        'Task "a": durationDays must be a multiple of 0.5 working days',
      ],
    });
  });

  it("reports unknown ids, slot boundaries and lags once the shape is right", () => {
    const input = example();
    input.tasks[1].calendar = ["workshop", "site"];
    input.tasks[0].actualStart = "2026-03-03T10:00";
    input.links.push({ from: "template", to: "paint" });
    input.links.push({ from: "fix", to: "template", lag: 0.25 });
    const r = parseProgrammeInput(input);
    expect(r).toEqual({
      ok: false,
      problems: [
        "Link fix → template: lag must be a multiple of 0.5 working days",
      ],
    });
    input.links.pop();
    expect(parseProgrammeInput(input)).toEqual({
      ok: false,
      problems: [
        'Task "fix": actualStart 2026-03-03T10:00 is not at the start of a slot (08:00 or 12:00)',
        'Task "template" uses calendar "site", which is not in calendars',
        'Link template → paint: task "paint" is not in tasks',
      ],
    });
  });

  it("rejects a loop, naming its tasks by name", () => {
    const input = example();
    input.links.push({ from: "template", to: "fix" });
    expect(parseProgrammeInput(input)).toEqual({
      ok: false,
      problems: [
        "Links form a loop: Fix carcasses & scribes → Template coving → Fix carcasses & scribes",
      ],
    });
  });

  it("rejects a task that waits for itself, by name", () => {
    const input = example();
    input.links.push({ from: "template", to: "template" });
    expect(parseProgrammeInput(input)).toEqual({
      ok: false,
      problems: ["Template coving cannot wait for itself"],
    });
  });

  it("rejects something that is not an object", () => {
    expect(parseProgrammeInput([])).toEqual({
      ok: false,
      problems: ["The input must be a JSON object with dataDate and tasks"],
    });
  });
});

describe("the CLI (npm run programme -- FILE.json)", () => {
  let results: { status: number | null; stdout: string; stderr: string }[] = [];
  beforeAll(async () => {
    results = await runCliMany([example(), bad, "{ not json"]);
  }, 120000);

  it("prints the result JSON only, on stdout, for the spec example", () => {
    const [ok] = results;
    expect(ok.status).toBe(0);
    expect(ok.stderr).toBe("");
    expect(JSON.parse(ok.stdout)).toEqual(
      JSON.parse(
        readFileSync(join(fixtures, "spec-example.expected.json"), "utf8"),
      ),
    );
  });

  it("prints one line per problem on stderr and exits non-zero for invalid input", () => {
    const [, invalid, notJson] = results;
    expect(invalid.status).not.toBe(0);
    expect(invalid.stdout).toBe("");
    expect(invalid.stderr.trimEnd().split("\n")).toEqual([
      "dataDate must be a date written YYYY-MM-DD",
      'Task "a": durationDays must be a multiple of 0.5 working days',
    ]);
    expect(notJson.status).not.toBe(0);
    expect(notJson.stdout).toBe("");
    expect(notJson.stderr).toMatch(/^\S+input-2\.json is not valid JSON: /);
  });
});
