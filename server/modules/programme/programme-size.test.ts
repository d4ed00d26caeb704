// Size figures of GET /programme (issue 15), written to tests/output/programme-size.json.
import { writeFileSync, mkdirSync } from "node:fs";
import { afterAll, beforeAll, expect, it } from "vitest";
import {
  signIn,
  startTestApp,
  type TestApp,
} from "../../../tests/setup/test-app";
import {
  demoAccounts,
  demoJobTitles,
} from "../../../tests/factories/demo-scenario";
import { buildBigProgramme } from "../../../tests/factories/big-programme";
import { localToday } from "../jobs/jobs.presenter";
import { Job } from "../jobs/jobs.entity";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ demo: true });
}, 120_000);
afterAll(async () => t?.close());

it("measures", async () => {
  const owner = await signIn(t, demoAccounts.owner.email);
  const alcoves = await t.db.ds.manager.findOneByOrFail(Job, {
    title: demoJobTitles.alcoves,
  });
  const big = await buildBigProgramme(
    t.db.ds,
    localToday("Europe/London"),
    400,
  );
  const out: Record<string, unknown> = {};
  out.debug = await t.db.ds.query(
    "SELECT t.name, t.party, b.state, b.start FROM bookings b JOIN tasks t ON t.id = b.taskId WHERE b.jobId = ?",
    [big.id],
  );
  for (const [name, id] of [
    ["alcoves", alcoves.id],
    ["400", big.id],
  ] as const) {
    const res = await owner.agent
      .get(`/api/jobs/${id}/programme`)
      .set("Accept-Encoding", "identity")
      .expect(200);
    const parts: Record<string, number> = {};
    for (const [k, v] of Object.entries(res.body))
      parts[k] = JSON.stringify(v).length;
    const fields: Record<string, number> = {};
    for (const r of res.body.result.tasks)
      for (const [k, v] of Object.entries(r))
        fields[k] = (fields[k] ?? 0) + JSON.stringify(v).length + k.length + 3;
    out[name] = {
      total: JSON.stringify(res.body).length,
      parts,
      fields,
      sample: res.body.result.tasks.slice(0, 3),
      problems: res.body.result.tasks
        .flatMap((r: { problems: unknown[] }) => r.problems)
        .slice(0, 3),
      inputSample: {
        ...res.body.input,
        tasks: res.body.input.tasks.slice(0, 2),
        links: [],
      },
    };
  }
  mkdirSync("tests/output", { recursive: true });
  writeFileSync(
    "tests/output/programme-size.json",
    JSON.stringify(out, null, 2),
  );
  expect(out).toBeTruthy();
});
