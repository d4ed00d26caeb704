import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../../tests/setup/test-app";
import {
  demoAccounts,
  demoJobTitles,
  DEMO_WORKSHOP_NAME,
} from "../../../tests/factories/demo-scenario";
import {
  applyProgrammeEdit,
  cautionFor,
  type ProgrammeEdit,
  type ProgrammeResponse,
} from "../../../shared/schemas";
import { AuditEntry } from "../audit/audit.entity";
import { Customer } from "../customers/customers.entity";
import { Job } from "../jobs/jobs.entity";
import { ProgrammeStarter } from "../starters/starters.entity";
import { Workshop } from "../workshops/workshops.entity";

let t: TestApp;
let owner: Session;
let workshopId: string;
let rosaId: string;

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  const m = t.db.ds.manager;
  workshopId = (await m.findOneByOrFail(Workshop, { name: DEMO_WORKSHOP_NAME }))
    .id;
  rosaId = (
    await m.findOneByOrFail(Customer, { email: demoAccounts.customer.email })
  ).id;
  owner = await signIn(t, demoAccounts.owner.email);
}, 120_000);
afterAll(async () => t?.close());

const newJob = {
  customerId: "",
  siteAddress: "3 Example Row, Wetherfold",
  postcode: "QX3 3AB",
  area: "Wetherfold",
  holidayRegion: "GB-ENG",
  handoverDate: null,
};

async function jobFromStarter(name: string, title: string): Promise<string> {
  const starter = await t.db.ds.manager.findOneByOrFail(ProgrammeStarter, {
    workshopId,
    name,
  });
  const res = await owner.agent
    .post(`/api/workshops/${workshopId}/jobs`)
    .set("X-CSRF-Token", owner.csrf)
    .send({ ...newJob, customerId: rosaId, title, starterId: starter.id });
  expect(res.status).toBe(201);
  return res.body.id;
}

const programme = async (jobId: string): Promise<ProgrammeResponse> =>
  (await owner.agent.get(`/api/jobs/${jobId}/programme`).expect(200)).body;
const taskId = (p: ProgrammeResponse, name: string) =>
  p.tasks.find((x) => x.name === name)!.id;
/**
 * The programme after an edit's answer, laid over the one before as the client does (issue 15),
 * and checked against a fresh GET.
 */
async function afterEdit(
  p: ProgrammeResponse,
  edit: ProgrammeEdit,
): Promise<ProgrammeResponse> {
  expect(edit.version).toBe(p.version + 1);
  const next = applyProgrammeEdit(p, edit);
  expect(next).toEqual(await programme(p.jobId));
  return next;
}
const resultOf = (p: ProgrammeResponse, name: string) =>
  p.result.tasks.find((x) => x.id === taskId(p, name))!;

describe("the demo job's computed programme", () => {
  it("says Template coving waits for Fix carcasses & scribes, and where the plasterer's booking stands", async () => {
    const job = await t.db.ds.manager.findOneByOrFail(Job, {
      title: demoJobTitles.alcoves,
    });
    const p = await programme(job.id);
    expect(p.tasks).toHaveLength(9);
    const template = resultOf(p, "Template coving");
    expect(template.readiness.state).toBe("waiting");
    expect(template.readiness.waitingOn.map((w) => w.task)).toEqual([
      taskId(p, "Fix carcasses & scribes"),
    ]);
    expect(resultOf(p, "Fix carcasses & scribes").readiness.state).toBe(
      "started",
    );
    expect(resultOf(p, "Survey & measure").readiness.state).toBe("done");
    // The booking pins the task to its booked date.
    const booking = p.tasks.find((x) => x.name === "Template coving")!.booking!;
    expect(booking.tradeName).toBe("Ashby Plaster & Coving");
    expect(template.plannedStart).toBe(booking.start);
    // The engine input is handed to the client for instant previews: the site calendar is in it.
    expect(p.engine.calendars.map((c) => c.id)).toEqual(
      expect.arrayContaining(["workshop", "site"]),
    );
  });
});

describe("starting programmes", () => {
  it("lists the three editable starters with their common-practice lags", async () => {
    const res = await owner.agent
      .get(`/api/workshops/${workshopId}/starters`)
      .expect(200);
    expect(res.body.starters.map((s: { name: string }) => s.name)).toEqual([
      "Alcove cabinets (pair)",
      "Bookcase wall",
      "Fitted wardrobe",
    ]);
    const alcove = res.body.starters[0];
    const drying = alcove.links.find(
      (l: { lagUnit: string }) => l.lagUnit === "elapsedHours",
    );
    expect(drying).toMatchObject({ from: "coving", to: "paint", lag: 24 });
    expect(drying.note).toMatch(/common practice/);
  });

  it("creates a job from a starter, dated from the workshop's first free start", async () => {
    const jobId = await jobFromStarter(
      "Alcove cabinets (pair)",
      "Alcoves from a starter",
    );
    const p = await programme(jobId);
    expect(p.tasks.map((x) => x.name)).toEqual([
      "Survey & measure",
      "Electrician first fix (cabinet lights)",
      "Fix carcasses & scribes",
      "Template coving",
      "Fit coving & make good",
      "Hang doors",
      "Electrician second fix",
      "Fill, caulk & paint",
      "Walk-round with the customer",
    ]);
    expect(p.links).toHaveLength(9);
    const survey = p.tasks.find((x) => x.name === "Survey & measure")!;
    expect(survey.notEarlierThan).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(survey.notEarlierThan! >= p.dataDate).toBe(true);
    // The paint waits 24 h after the coving: its start is at least a day after the coving's finish.
    const coving = resultOf(p, "Fit coving & make good");
    const paint = resultOf(p, "Fill, caulk & paint");
    expect(paint.earlyStart > coving.earlyFinish).toBe(true);
    // The screen words the caution from the task's party and hazards (shared `cautionFor`).
    const firstFix = p.tasks.find(
      (x) => x.name === "Electrician first fix (cabinet lights)",
    )!;
    expect(cautionFor(firstFix.party, firstFix.hazards)).toMatch(
      /qualified, registered electrician/,
    );
  });

  it("refuses a starter whose link names a missing task, naming the field", async () => {
    const starter = await t.db.ds.manager.findOneByOrFail(ProgrammeStarter, {
      workshopId,
      name: "Fitted wardrobe",
    });
    const res = await owner.agent
      .put(`/api/workshops/${workshopId}/starters/${starter.id}`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        name: "Fitted wardrobe",
        tasks: starter.tasks,
        links: [...starter.links, { from: "nope", to: "handover" }],
      });
    expect(res.status).toBe(400);
    expect(res.body.error.fields[`links.${starter.links.length}.from`]).toEqual(
      ['No task with key "nope"'],
    );
  });
});

describe("editing a programme", () => {
  it("adds a task and a link, and refuses a loop with 422 naming the tasks", async () => {
    const jobId = await jobFromStarter("Bookcase wall", "Bookcase for editing");
    let p = await programme(jobId);
    const add = await owner.agent
      .post(`/api/jobs/${jobId}/tasks`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: p.version,
        name: "Fit cornice returns",
        party: "workshop",
        durationDays: 0.5,
      });
    expect(add.status).toBe(201);
    expect(add.body.tasks.map((x: { id: string }) => x.id)).toEqual([
      add.body.taskId,
    ]);
    p = await afterEdit(p, add.body);
    const link = await owner.agent
      .post(`/api/jobs/${jobId}/links`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: p.version,
        fromTaskId: taskId(p, "Fit shelves & doors"),
        toTaskId: taskId(p, "Fit cornice returns"),
        kind: "FS",
        lag: 0,
      });
    expect(link.status).toBe(201);
    p = await afterEdit(p, link.body);
    expect(
      resultOf(p, "Fit cornice returns").readiness.waitingOn.map((w) => w.task),
    ).toEqual([taskId(p, "Fit shelves & doors")]);
    const loop = await owner.agent
      .post(`/api/jobs/${jobId}/links`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: p.version,
        fromTaskId: taskId(p, "Fit cornice returns"),
        toTaskId: taskId(p, "Survey & measure"),
      });
    expect(loop.status).toBe(422);
    expect(loop.body.error.message).toMatch(/loop/i);
    // By name, never by id (issue 13).
    expect(loop.body.error.message).toContain("Survey & measure");
    expect(loop.body.error.message).not.toContain(
      taskId(p, "Survey & measure"),
    );
    // Nothing was saved: the version is unchanged and the link is not there.
    const after = await programme(jobId);
    expect(after.version).toBe(p.version);
    expect(after.links).toHaveLength(p.links.length);
  });

  it("refuses a stale version with 409 saying who changed what", async () => {
    const jobId = await jobFromStarter(
      "Fitted wardrobe",
      "Wardrobe for a conflict",
    );
    const p = await programme(jobId);
    const fitter = await signIn(t, demoAccounts.fitter.email);
    await fitter.agent
      .patch(`/api/jobs/${jobId}/tasks/${taskId(p, "Lay floor")}`)
      .set("X-CSRF-Token", fitter.csrf)
      .send({ version: p.version, durationDays: 1.5 })
      .expect(200);
    const stale = await owner.agent
      .patch(`/api/jobs/${jobId}/tasks/${taskId(p, "Lay floor")}`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ version: p.version, durationDays: 2 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe("version-conflict");
    expect(stale.body.error.message).toMatch(/Joel Vane edited a task/);
    expect(
      (await programme(jobId)).tasks.find((x) => x.name === "Lay floor")!
        .durationDays,
    ).toBe(1.5);
  });

  it("previews a move without saving, then applies it; the server's impact names the moved tasks", async () => {
    const jobId = await jobFromStarter(
      "Alcove cabinets (pair)",
      "Alcoves for a slip",
    );
    const p = await programme(jobId);
    const doors = taskId(p, "Hang doors");
    const early = resultOf(p, "Hang doors").earlyStart.slice(0, 10);
    // Two weeks later than it could start: certainly later than anything else allows.
    const later = new Date(`${early}T12:00:00Z`);
    later.setUTCDate(later.getUTCDate() + 14);
    const to = later.toISOString().slice(0, 10);
    const preview = await owner.agent
      .post(`/api/jobs/${jobId}/programme/preview`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: p.version,
        changes: [{ taskId: doors, notEarlierThan: to }],
      });
    expect(preview.status).toBe(200);
    const moved = preview.body.impact.moves.map(
      (mv: { task: string }) => mv.task,
    );
    expect(moved).toContain(doors);
    expect(moved).toContain(taskId(p, "Electrician second fix"));
    expect(preview.body.impact.handover.changeDays).toBeGreaterThan(0);
    expect((await programme(jobId)).version).toBe(p.version);

    const applied = await owner.agent
      .post(`/api/jobs/${jobId}/programme/apply`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: p.version,
        changes: [{ taskId: doors, notEarlierThan: to }],
      });
    expect(applied.status).toBe(200);
    expect(applied.body.impact).toEqual(preview.body.impact);
    const after = await afterEdit(p, applied.body);
    expect(resultOf(after, "Hang doors").plannedStart.slice(0, 10) >= to).toBe(
      true,
    );
    const entries = await t.db.ds
      .getRepository(AuditEntry)
      .findBy({ entityId: jobId, action: "programme.changed" });
    expect(entries.map((e) => e.detail.summary)).toContain("moved a task");
  });

  it("records progress: a task marked done makes its successor clear to start", async () => {
    const jobId = await jobFromStarter(
      "Fitted wardrobe",
      "Wardrobe for progress",
    );
    let p = await programme(jobId);
    const survey = taskId(p, "Survey & measure");
    // Surveyed a week ago (a date only: that morning to that day's end), so today is clear.
    const d = new Date(`${p.dataDate}T12:00:00Z`);
    d.setUTCDate(d.getUTCDate() - 7);
    const weekAgo = d.toISOString().slice(0, 10);
    const res = await owner.agent
      .post(`/api/jobs/${jobId}/tasks/${survey}/progress`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: p.version,
        actualStart: weekAgo,
        actualFinish: weekAgo,
      });
    expect(res.status).toBe(200);
    p = await afterEdit(p, res.body);
    expect(resultOf(p, "Survey & measure").readiness.state).toBe("done");
    expect(resultOf(p, "Lay floor").readiness.state).toBe("clear");
    const bad = await owner.agent
      .post(`/api/jobs/${jobId}/tasks/${survey}/progress`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: p.version,
        actualStart: null,
        actualFinish: p.dataDate,
      });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.actualStart).toEqual([
      "A task is started before it is done",
    ]);
  });

  it("reorders, edits and removes tasks and links", async () => {
    const jobId = await jobFromStarter(
      "Fitted wardrobe",
      "Wardrobe for tidying",
    );
    let p = await programme(jobId);
    const reversed = [...p.tasks].reverse().map((x) => x.id);
    p = await afterEdit(
      p,
      (
        await owner.agent
          .put(`/api/jobs/${jobId}/tasks/order`)
          .set("X-CSRF-Token", owner.csrf)
          .send({ version: p.version, taskIds: reversed })
          .expect(200)
      ).body,
    );
    expect(p.tasks.map((x) => x.id)).toEqual(reversed);
    const missing = await owner.agent
      .put(`/api/jobs/${jobId}/tasks/order`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ version: p.version, taskIds: reversed.slice(1) });
    expect(missing.status).toBe(422);
    const link = p.links.find((l) => l.lagUnit === "workingDays")!;
    p = await afterEdit(
      p,
      (
        await owner.agent
          .patch(`/api/jobs/${jobId}/links/${link.id}`)
          .set("X-CSRF-Token", owner.csrf)
          .send({ version: p.version, lag: 1.5 })
          .expect(200)
      ).body,
    );
    expect(p.links.find((l) => l.id === link.id)!.lag).toBe(1.5);
    const halfHour = await owner.agent
      .patch(`/api/jobs/${jobId}/links/${link.id}`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ version: p.version, lag: 0.3 });
    expect(halfHour.status).toBe(400);
    p = await afterEdit(
      p,
      (
        await owner.agent
          .delete(`/api/jobs/${jobId}/links/${link.id}?version=${p.version}`)
          .set("X-CSRF-Token", owner.csrf)
          .expect(200)
      ).body,
    );
    expect(p.links.some((l) => l.id === link.id)).toBe(false);
    const handover = taskId(p, "Walk-round with the customer");
    p = await afterEdit(
      p,
      (
        await owner.agent
          .delete(`/api/jobs/${jobId}/tasks/${handover}?version=${p.version}`)
          .set("X-CSRF-Token", owner.csrf)
          .expect(200)
      ).body,
    );
    expect(p.tasks.some((x) => x.id === handover)).toBe(false);
    const badDuration = await owner.agent
      .post(`/api/jobs/${jobId}/tasks`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: p.version,
        name: "Odd",
        party: "workshop",
        durationDays: 0.3,
      });
    expect(badDuration.status).toBe(400);
    expect(badDuration.body.error.fields.durationDays).toEqual([
      "Use whole or half days (0.5 is one morning or afternoon)",
    ]);
  });
});
