// A link's lag out of range says the range (issue 13): a lag of 10^9 used to answer "Enter the
// lag", as if the field were empty. The range is the shared schema's (`LAG_LIMITS`), which the
// link form uses too.
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
import {
  createLinkBodySchema,
  type ProgrammeResponse,
} from "../../../shared/schemas";
import { Customer } from "../customers/customers.entity";
import { Workshop } from "../workshops/workshops.entity";

let t: TestApp;
let owner: Session;
let jobId: string;

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  const m = t.db.ds.manager;
  owner = await signIn(t, demoAccounts.owner.email);
  jobId = await createJobFromStarter(owner, {
    workshopId: (
      await m.findOneByOrFail(Workshop, { name: DEMO_WORKSHOP_NAME })
    ).id,
    customerId: (
      await m.findOneByOrFail(Customer, { email: demoAccounts.customer.email })
    ).id,
    title: "Alcoves for lag limits",
  });
}, 120_000);
afterAll(async () => t?.close());

const programme = async (): Promise<ProgrammeResponse> =>
  (await owner.agent.get(`/api/jobs/${jobId}/programme`).expect(200)).body;
const taskId = (p: ProgrammeResponse, name: string) =>
  p.tasks.find((x) => x.name === name)!.id;

const WORKING = "Keep the lag within 60 working days either way";
const HOURS = "Keep the lag within 720 hours (30 days) either way";

describe("a link's lag out of range", () => {
  it("adding a link: says the range in the lag's own unit, nothing saved", async () => {
    const p = await programme();
    for (const [lagUnit, message] of [
      ["workingDays", WORKING],
      ["elapsedHours", HOURS],
    ] as const) {
      const res = await owner.agent
        .post(`/api/jobs/${jobId}/links`)
        .set("X-CSRF-Token", owner.csrf)
        .send({
          version: p.version,
          fromTaskId: taskId(p, "Survey & measure"),
          toTaskId: taskId(p, "Hang doors"),
          lag: 1e9,
          lagUnit,
        });
      expect(res.status).toBe(400);
      expect(res.body.error.fields.lag).toEqual([message]);
    }
    const after = await programme();
    expect(after.version).toBe(p.version);
    expect(after.links).toHaveLength(p.links.length);
  });

  it("editing a link: the range of the unit sent, or of the link's stored unit when only the lag is sent", async () => {
    const p = await programme();
    const drying = p.links.find((l) => l.lagUnit === "elapsedHours")!;
    const working = p.links.find((l) => l.lagUnit === "workingDays")!;
    const edit = (linkId: string, body: object) =>
      owner.agent
        .patch(`/api/jobs/${jobId}/links/${linkId}`)
        .set("X-CSRF-Token", owner.csrf)
        .send({ version: p.version, ...body });

    const sent = await edit(working.id, { lag: 1e9, lagUnit: "workingDays" });
    expect(sent.status).toBe(400);
    expect(sent.body.error.fields.lag).toEqual([WORKING]);
    const stored = await edit(drying.id, { lag: 1e9 });
    expect(stored.status).toBe(400);
    expect(stored.body.error.fields.lag).toEqual([HOURS]);
    // At the limit is allowed: 720 h of drying saves.
    const limit = await edit(drying.id, { lag: 720 });
    expect(limit.status).toBe(200);
    expect(
      limit.body.links.find((l: { id: string }) => l.id === drying.id).lag,
    ).toBe(720);
  });

  it("the link form's schema gives the same words (the form validates with it)", () => {
    const r = createLinkBodySchema.safeParse({
      version: 1,
      fromTaskId: "0196a000-0000-7000-8000-000000000001",
      toTaskId: "0196a000-0000-7000-8000-000000000002",
      lag: 1e9,
      lagUnit: "workingDays",
    });
    expect(r.success).toBe(false);
    expect(r.error!.issues.map((i) => [i.path.join("."), i.message])).toEqual([
      ["lag", WORKING],
    ]);
  });
});
