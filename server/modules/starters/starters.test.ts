// Starting programmes are checked by the programme engine, as live programmes are (issue 13,
// item 4): a starter holding a loop used to save, and every job made from it then answered 422
// on its programme for ever.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../../tests/setup/test-app";
import {
  demoAccounts,
  DEMO_WORKSHOP_NAME,
} from "../../../tests/factories/demo-scenario";
import { createJobFromStarter } from "../../../tests/setup/jobs";
import type { StarterResponse } from "../../../shared/schemas";
import { newId } from "../../db/columns";
import { Customer } from "../customers/customers.entity";
import { Job } from "../jobs/jobs.entity";
import { Workshop } from "../workshops/workshops.entity";
import { ProgrammeStarter } from "./starters.entity";

let t: TestApp;
let owner: Session;
let workshopId: string;
let customerId: string;

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  const m = t.db.ds.manager;
  workshopId = (await m.findOneByOrFail(Workshop, { name: DEMO_WORKSHOP_NAME }))
    .id;
  customerId = (
    await m.findOneByOrFail(Customer, { email: demoAccounts.customer.email })
  ).id;
  owner = await signIn(t, demoAccounts.owner.email);
}, 120_000);
afterAll(async () => t?.close());

const starterNamed = async (name: string): Promise<StarterResponse> =>
  (
    await owner.agent.get(`/api/workshops/${workshopId}/starters`).expect(200)
  ).body.starters.find((s: StarterResponse) => s.name === name);

const put = (s: StarterResponse, change: Partial<StarterResponse>) =>
  owner.agent
    .put(`/api/workshops/${workshopId}/starters/${s.id}`)
    .set("X-CSRF-Token", owner.csrf)
    .send({
      name: s.name,
      description: s.description,
      tasks: s.tasks,
      links: s.links,
      ...change,
    });

// Bookcase wall's keys and names: skim = "Skim the back wall", carcasses = "Fix carcasses &
// scribes", paint = "Mist coat & two coats", shelves = "Fit shelves & doors"; its links run
// skim → carcasses → paint → shelves.
describe("a starter the engine refuses is not saved", () => {
  const cases = [
    {
      what: "a task that waits for itself",
      link: { from: "skim", to: "skim" },
      message: "Skim the back wall cannot wait for itself",
    },
    {
      what: "a two-task loop",
      link: { from: "shelves", to: "paint" },
      // The engine starts a loop at its smallest id (here the key "paint").
      message:
        "Links form a loop: Mist coat & two coats → Fit shelves & doors → Mist coat & two coats",
    },
    {
      what: "a three-task loop",
      link: { from: "paint", to: "skim" },
      message:
        "Links form a loop: Fix carcasses & scribes → Mist coat & two coats → Skim the back wall → Fix carcasses & scribes",
    },
  ];
  for (const c of cases)
    it(`refuses ${c.what} with 422 naming the tasks, and keeps the starter as it was`, async () => {
      const before = await starterNamed("Bookcase wall");
      const stored = await t.db.ds.manager.findOneByOrFail(ProgrammeStarter, {
        id: before.id,
      });
      const res = await put(before, {
        links: [
          ...before.links,
          { ...c.link, kind: "FS", lag: 0, lagUnit: "workingDays", note: "" },
        ],
      });
      expect(res.status).toBe(422);
      expect(res.body.error.code).toBe("unprocessable");
      expect(res.body.error.message).toBe(c.message);
      expect(res.body.error.fields.programme).toEqual([c.message]);
      // Names only: every task the loop lists is a task's name, never its key.
      const names = before.tasks.map((x) => x.name);
      const listed = (res.body.error.message as string)
        .replace(/^Links form a loop: /, "")
        .replace(/ cannot wait for itself$/, "")
        .split(" → ");
      for (const task of listed) expect(names).toContain(task);
      expect(await starterNamed("Bookcase wall")).toEqual(before);
      const after = await t.db.ds.manager.findOneByOrFail(ProgrammeStarter, {
        id: before.id,
      });
      expect(after.updatedAt).toEqual(stored.updatedAt);
    });
});

describe("a valid starter edit", () => {
  it("saves, and a job made from the starter has a programme that loads", async () => {
    const before = await starterNamed("Bookcase wall");
    const res = await put(before, {
      tasks: [
        ...before.tasks,
        {
          key: "snag",
          name: "Snag visit",
          party: "workshop",
          durationDays: 0.5,
          hazards: [],
          customerNote: "",
        },
      ],
      links: [
        ...before.links,
        {
          from: "handover",
          to: "snag",
          kind: "FS",
          lag: 10,
          lagUnit: "workingDays",
          note: "",
        },
      ],
    });
    expect(res.status).toBe(200);
    expect(res.body.tasks.map((x: { key: string }) => x.key)).toContain("snag");
    expect(await starterNamed("Bookcase wall")).toEqual(res.body);

    const jobId = await createJobFromStarter(owner, {
      workshopId,
      customerId,
      title: "Bookcase from the edited starter",
      starter: "Bookcase wall",
    });
    const p = await owner.agent.get(`/api/jobs/${jobId}/programme`);
    expect(p.status).toBe(200);
    expect(p.body.tasks.map((x: { name: string }) => x.name)).toContain(
      "Snag visit",
    );
  });
});

describe("a starter saved with a loop before the engine checked starters", () => {
  it("makes no job: 422 naming the tasks, and nothing is created", async () => {
    const good = await starterNamed("Fitted wardrobe");
    const bad = await t.db.ds.manager.save(
      t.db.ds.manager.create(ProgrammeStarter, {
        id: newId(),
        workshopId,
        name: "Wardrobe with a loop",
        description: "",
        tasks: good.tasks,
        // Written straight to the table, as the old PUT let it through.
        links: [
          ...good.links,
          {
            from: good.links[0].to,
            to: good.links[0].from,
            kind: "FS",
            lag: 0,
            lagUnit: "workingDays",
            note: "",
          },
        ],
      }),
    );
    const names = new Map(good.tasks.map((x) => [x.key, x.name]));
    const jobsBefore = await t.db.ds.manager.countBy(Job, { workshopId });
    const res = await owner.agent
      .post(`/api/workshops/${workshopId}/jobs`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        title: "Wardrobe from a looped starter",
        customerId,
        siteAddress: "9 Example Row, Wetherfold",
        postcode: "QX9 9AB",
        area: "Example Row, Wetherfold",
        holidayRegion: "GB-ENG",
        starterId: bad.id,
        status: "planned",
      });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/^Links form a loop: /);
    expect(res.body.error.message).toContain(names.get(good.links[0].from)!);
    expect(res.body.error.message).toContain(names.get(good.links[0].to)!);
    expect(await t.db.ds.manager.countBy(Job, { workshopId })).toBe(jobsBefore);
  });
});

describe("a starter's lags", () => {
  it("says the allowed range for a lag of 10^9, and refuses a working-day lag that is not a half day", async () => {
    const before = await starterNamed("Alcove cabinets (pair)");
    const huge = before.links.findIndex((l) => l.lagUnit === "workingDays");
    const drying = before.links.findIndex((l) => l.lagUnit === "elapsedHours");
    const res = await put(before, {
      links: before.links.map((l, i) =>
        i === huge || i === drying ? { ...l, lag: 1e9 } : l,
      ),
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields[`links.${huge}.lag`]).toEqual([
      "Keep the lag within 60 working days either way",
    ]);
    expect(res.body.error.fields[`links.${drying}.lag`]).toEqual([
      "Keep the lag within 720 hours (30 days) either way",
    ]);
    // The engine counts working-day lags in half-day slots: 0.3 would save, then refuse every job.
    const third = await put(before, {
      links: before.links.map((l, i) => (i === huge ? { ...l, lag: 0.3 } : l)),
    });
    expect(third.status).toBe(400);
    expect(third.body.error.fields[`links.${huge}.lag`]).toEqual([
      "Working-day lags go in whole or half days",
    ]);
    expect(await starterNamed("Alcove cabinets (pair)")).toEqual(before);
  });
});

describe("deleting a starter (issue 14)", () => {
  it("the owner deletes one; a job made from it keeps its programme; a fitter may not", async () => {
    const fitter = await signIn(t, demoAccounts.fitter.email);
    const starter = await starterNamed("Bookcase wall");
    const jobId = await createJobFromStarter(owner, {
      workshopId,
      customerId,
      title: "Bookcase made before the delete",
      starter: "Bookcase wall",
    });
    const path = `/api/workshops/${workshopId}/starters/${starter.id}`;
    await fitter.agent
      .delete(path)
      .set("X-CSRF-Token", fitter.csrf)
      .expect(403);
    await owner.agent.delete(path).set("X-CSRF-Token", owner.csrf).expect(204);
    const left = await owner.agent
      .get(`/api/workshops/${workshopId}/starters`)
      .expect(200);
    expect(
      (left.body.starters as StarterResponse[]).map((s) => s.name),
    ).not.toContain("Bookcase wall");
    const programme = await owner.agent
      .get(`/api/jobs/${jobId}/programme`)
      .expect(200);
    expect(programme.body.tasks).toHaveLength(starter.tasks.length);
    await owner.agent.delete(path).set("X-CSRF-Token", owner.csrf).expect(404);
  });
});
