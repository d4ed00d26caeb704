// Issue 15: the programme response carries the engine input once (the client rebuilds the exact
// input the server scheduled), and every edit answers with what changed, which laid over the
// programme before gives the programme a fresh GET answers.
import { mkdirSync, writeFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  applyProgrammeEdit,
  engineInputOf,
  type ProgrammeEdit,
  type ProgrammeResponse,
} from "../../../shared/schemas";
import { buildBigProgramme } from "../../../tests/factories/big-programme";
import {
  bigJobTitle,
  growDemoWorkshop,
} from "../../../tests/factories/big-workshop";
import {
  DEMO_WORKSHOP_NAME,
  demoAccounts,
  demoJobTitles,
} from "../../../tests/factories/demo-scenario";
import { demoSecondWorkshop } from "../../../tests/factories/demo-second-workshop";
import {
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../../tests/setup/test-app";
import { Job } from "../jobs/jobs.entity";
import { localToday } from "../jobs/jobs.presenter";
import { Workshop } from "../workshops/workshops.entity";
import { loadProgramme } from "./programme-input";

let t: TestApp;
let owner: Session;
let big: Job;
const today = localToday("Europe/London");

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  // Grown jobs book the demo's trades in every live state, and the shared plasterer across both
  // workshops (busy "for another workshop"); the long job has 400 tasks.
  await growDemoWorkshop(t.db.ds, today, 3);
  big = await buildBigProgramme(t.db.ds, today, 400);
  owner = await signIn(t, demoAccounts.owner.email);
}, 120_000);
afterAll(async () => t?.close());

const jobNamed = (title: string) =>
  t.db.ds.manager.findOneByOrFail(Job, { title });
const get = async (s: Session, jobId: string) =>
  s.agent.get(`/api/jobs/${jobId}/programme`).expect(200);
const programme = async (jobId: string): Promise<ProgrammeResponse> =>
  (await get(owner, jobId)).body;
const taskNamed = (p: ProgrammeResponse, name: string) =>
  p.tasks.find((x) => x.name === name)!;
const resultOf = (p: ProgrammeResponse, id: string) =>
  p.result.tasks.find((r) => r.id === id)!;

/** The edit laid over the programme before it must be exactly what a fresh GET answers. */
async function checkEdit(
  before: ProgrammeResponse,
  edit: ProgrammeEdit,
): Promise<ProgrammeResponse> {
  const fresh = await programme(before.jobId);
  expect(edit.version).toBe(before.version + 1);
  expect(fresh.version).toBe(edit.version);
  expect(applyProgrammeEdit(before, edit)).toEqual(fresh);
  return fresh;
}

describe("the engine input, carried once", () => {
  it("rebuilt from the response, is the input the server scheduled, for every demo and grown job and the 400-task one", async () => {
    const m = t.db.ds.manager;
    const jobs = await m.find(Job, { order: { title: "ASC" } });
    const workshops = new Map((await m.find(Workshop)).map((w) => [w.id, w]));
    const second = await signIn(t, demoSecondWorkshop.owner.email);
    const titles = jobs.map((j) => j.title);
    // The cases that matter are all here: the demo's jobs, grown ones of both workshops, the long one.
    expect(titles).toEqual(
      expect.arrayContaining([
        demoJobTitles.alcoves,
        demoJobTitles.wardrobe,
        demoJobTitles.bookcase,
        bigJobTitle(1),
        bigJobTitle(1001),
        big.title,
      ]),
    );
    let withBusy = 0;
    let withResources = 0;
    for (const job of jobs) {
      const demo = workshops.get(job.workshopId)!.name === DEMO_WORKSHOP_NAME;
      const p: ProgrammeResponse = (await get(demo ? owner : second, job.id))
        .body;
      const server = await loadProgramme(
        m,
        job,
        workshops.get(job.workshopId)!,
      );
      // Through JSON, as the server sent it.
      expect(engineInputOf(p)).toEqual(
        JSON.parse(JSON.stringify(server.input)),
      );
      expect(p).not.toHaveProperty("input");
      if (p.engine.busy.length) withBusy++;
      if (Object.keys(p.engine.resources).length) withResources++;
    }
    expect(withBusy).toBeGreaterThan(0);
    expect(withResources).toBeGreaterThan(0);
  });
});

describe("an edit answers with what changed", () => {
  it("a longer task: the task and its moved successors with their new dates, the same as a fresh GET", async () => {
    const before = await programme(big.id);
    // A workshop task a third of the way along the long job's chain, with a note for the customer.
    const task = before.tasks[120];
    expect(task.party).toBe("workshop");
    const res = await owner.agent
      .patch(`/api/jobs/${big.id}/tasks/${task.id}`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ version: before.version, durationDays: task.durationDays + 2 })
      .expect(200);
    const edit: ProgrammeEdit = res.body;
    expect(edit).not.toHaveProperty("engine");
    // Only the duration changed: the other fields are kept (an edit no longer resets them).
    expect(edit.tasks).toEqual([
      { ...task, durationDays: task.durationDays + 2 },
    ]);
    expect(edit.removedTaskIds).toEqual([]);
    expect(edit.links).toEqual([]);
    const fresh = await checkEdit(before, edit);
    // It ends two working days later; everything after it in the chain starts later, and the
    // answer carries each of those with its dates exactly as the fresh programme has them.
    const sent = new Map(edit.result.tasks.map((r) => [r.id, r]));
    expect(sent.get(task.id)).toEqual(resultOf(fresh, task.id));
    expect(resultOf(fresh, task.id).plannedFinish).not.toBe(
      resultOf(before, task.id).plannedFinish,
    );
    const moved = fresh.result.tasks.filter(
      (r) => r.plannedStart !== resultOf(before, r.id).plannedStart,
    );
    expect(moved.map((r) => r.id)).toEqual(
      before.tasks.slice(121).map((x) => x.id),
    );
    for (const r of moved) {
      expect(r.plannedStart > resultOf(before, r.id).plannedStart).toBe(true);
      expect(sent.get(r.id)).toEqual(r);
    }
    // A result that did not change at all is not sent again.
    for (const r of fresh.result.tasks)
      if (JSON.stringify(r) === JSON.stringify(resultOf(before, r.id)))
        expect(sent.has(r.id)).toBe(false);
    expect(edit.result.finish).toBe(fresh.result.finish);
    expect(edit.result.finish! > before.result.finish!).toBe(true);
    expect(edit.result.handoverSlipDays).toBe(fresh.result.handoverSlipDays);
    expect(edit.handover).toBe(fresh.handover);
  });

  it("every edit route's answer, laid over the programme before, is the programme after", async () => {
    const job = await jobNamed(demoJobTitles.bookcase);
    let p = await programme(job.id);
    const send = (req: ReturnType<typeof owner.agent.post>, status = 200) =>
      req.set("X-CSRF-Token", owner.csrf).expect(status);

    // Add a task: its id, and the task itself in the answer.
    const added = (
      await send(
        owner.agent.post(`/api/jobs/${job.id}/tasks`).send({
          version: p.version,
          name: "Fit cornice returns",
          party: "workshop",
          durationDays: 0.5,
        }),
        201,
      )
    ).body;
    expect(added.tasks.map((x: { id: string }) => x.id)).toEqual([
      added.taskId,
    ]);
    p = await checkEdit(p, added);
    const cornice = added.taskId as string;
    const first = p.tasks[0];

    // Add, change and remove a link.
    const linked = (
      await send(
        owner.agent.post(`/api/jobs/${job.id}/links`).send({
          version: p.version,
          fromTaskId: first.id,
          toTaskId: cornice,
          kind: "FS",
          lag: 1,
        }),
        201,
      )
    ).body as ProgrammeEdit;
    expect(linked.links).toHaveLength(1);
    p = await checkEdit(p, linked);
    const linkId = linked.links[0].id;
    const relagged = (
      await send(
        owner.agent
          .patch(`/api/jobs/${job.id}/links/${linkId}`)
          .send({ version: p.version, lag: 2 }),
      )
    ).body as ProgrammeEdit;
    expect(relagged.links).toEqual([{ ...linked.links[0], lag: 2 }]);
    expect(relagged.result.tasks.map((r) => r.id)).toContain(cornice);
    p = await checkEdit(p, relagged);
    const unlinked = (
      await send(
        owner.agent.delete(
          `/api/jobs/${job.id}/links/${linkId}?version=${p.version}`,
        ),
      )
    ).body as ProgrammeEdit;
    expect(unlinked.removedLinkIds).toEqual([linkId]);
    p = await checkEdit(p, unlinked);

    // Reorder: the new task to the top.
    const order = [
      cornice,
      ...p.tasks.map((x) => x.id).filter((id) => id !== cornice),
    ];
    const reordered = (
      await send(
        owner.agent
          .put(`/api/jobs/${job.id}/tasks/order`)
          .send({ version: p.version, taskIds: order }),
      )
    ).body as ProgrammeEdit;
    p = await checkEdit(p, reordered);
    expect(p.tasks.map((x) => x.id)).toEqual(order);

    // Progress, a move through apply (with the server's impact), then remove the task.
    const started = (
      await send(
        owner.agent.post(`/api/jobs/${job.id}/tasks/${cornice}/progress`).send({
          version: p.version,
          actualStart: p.dataDate,
          actualFinish: null,
        }),
      )
    ).body as ProgrammeEdit;
    expect(started.tasks.map((x) => x.id)).toEqual([cornice]);
    p = await checkEdit(p, started);
    const last = p.tasks[p.tasks.length - 1];
    const later = new Date(
      `${resultOf(p, last.id).plannedStart.slice(0, 10)}T12:00:00Z`,
    );
    later.setUTCDate(later.getUTCDate() + 14);
    const applied = (
      await send(
        owner.agent.post(`/api/jobs/${job.id}/programme/apply`).send({
          version: p.version,
          changes: [
            {
              taskId: last.id,
              notEarlierThan: later.toISOString().slice(0, 10),
            },
          ],
        }),
      )
    ).body;
    expect(
      applied.impact.moves.map((mv: { task: string }) => mv.task),
    ).toContain(last.id);
    p = await checkEdit(p, applied);
    const removed = (
      await send(
        owner.agent.delete(
          `/api/jobs/${job.id}/tasks/${cornice}?version=${p.version}`,
        ),
      )
    ).body as ProgrammeEdit;
    expect(removed.removedTaskIds).toEqual([cornice]);
    p = await checkEdit(p, removed);
  });

  it("an edit on an old version is still refused with 409, and changes nothing", async () => {
    const job = await jobNamed(bigJobTitle(3));
    const p = await programme(job.id);
    const task = taskNamed(p, "Fill, caulk & paint");
    await owner.agent
      .patch(`/api/jobs/${job.id}/tasks/${task.id}`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ version: p.version, durationDays: 2 })
      .expect(200);
    const stale = await owner.agent
      .patch(`/api/jobs/${job.id}/tasks/${task.id}`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ version: p.version, durationDays: 3 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe("version-conflict");
    const now = await programme(job.id);
    expect(now.version).toBe(p.version + 1);
    expect(taskNamed(now, "Fill, caulk & paint").durationDays).toBe(2);
  });
});

describe("sizes (issue 15)", () => {
  it("the 400-task programme no longer repeats its tasks and links, and a one-task edit answers in a few KB", async () => {
    const size = (body: unknown) => JSON.stringify(body).length;
    const alcoves = await jobNamed(demoJobTitles.alcoves);
    const small = await programme(alcoves.id);
    const p = await programme(big.id);
    expect(p.tasks).toHaveLength(400);
    const renamed = p.tasks[200];
    const rename = await owner.agent
      .patch(`/api/jobs/${big.id}/tasks/${renamed.id}`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ version: p.version, internalNote: "Wall out of true by 8 mm." })
      .expect(200);
    const after = await checkEdit(p, rename.body);
    const longer = await owner.agent
      .patch(`/api/jobs/${big.id}/tasks/${renamed.id}`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ version: after.version, durationDays: renamed.durationDays + 1 })
      .expect(200);
    await checkEdit(after, longer.body);
    const figures = {
      alcovesProgramme: size(small),
      programme400: size(p),
      programme400Parts: Object.fromEntries(
        Object.entries(p).map(([k, v]) => [k, size(v)]),
      ),
      noteEditAnswer400: size(rename.body),
      durationEditAnswer400: size(longer.body),
      durationEditMovedResults: longer.body.result.tasks.length,
    };
    mkdirSync("tests/output", { recursive: true });
    writeFileSync(
      "tests/output/programme-size.json",
      JSON.stringify(figures, null, 2),
    );
    // Before issue 15 the same job answered 618 KB (tasks and links twice), each edit the same.
    expect(figures.programme400).toBeLessThan(460_000);
    // A note changes one task and no dates: the task and a few small fields.
    expect(rename.body.tasks).toHaveLength(1);
    expect(rename.body.result.tasks).toEqual([]);
    expect(figures.noteEditAnswer400).toBeLessThan(2_000);
  });
});
