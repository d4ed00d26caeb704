import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  signIn,
  startTestApp,
  type TestApp,
} from "../../../tests/setup/test-app";
import {
  demoAccounts,
  demoJobTitles,
  DEMO_WORKSHOP_NAME,
} from "../../../tests/factories/demo-scenario";
import { demoSecondWorkshop } from "../../../tests/factories/demo-second-workshop";
import { Booking } from "../bookings/bookings.entity";
import { Customer } from "../customers/customers.entity";
import { Trade } from "../trades/trades.entity";
import { Workshop } from "../workshops/workshops.entity";
import {
  buildCustomer,
  buildWorkshop,
} from "../../../tests/factories/builders";
import { Job } from "./jobs.entity";

let t: TestApp;
let workshopId: string;
let alcovesId: string;
let rosaId: string;

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  const m = t.db.ds.manager;
  workshopId = (await m.findOneByOrFail(Workshop, { name: DEMO_WORKSHOP_NAME }))
    .id;
  alcovesId = (await m.findOneByOrFail(Job, { title: demoJobTitles.alcoves }))
    .id;
  rosaId = (
    await m.findOneByOrFail(Customer, { email: demoAccounts.customer.email })
  ).id;
}, 120_000);
afterAll(async () => t?.close());

describe("jobs list", () => {
  it("shows the owner all three demo jobs with their next event", async () => {
    const s = await signIn(t, demoAccounts.owner.email);
    const res = await s.agent.get("/api/jobs").expect(200);
    expect(res.body.jobs.map((j: { title: string }) => j.title).sort()).toEqual(
      Object.values(demoJobTitles).sort(),
    );
    const alcoves = res.body.jobs.find(
      (j: { title: string }) => j.title === demoJobTitles.alcoves,
    );
    expect(alcoves.nextEvent.label).toBe("Plasterer: Template coving");
    expect(alcoves.customerName).toBe("Rosa Pennick");
  });

  it("shows the customer only their own job, and the trade only the job they are booked on", async () => {
    const customer = await signIn(t, demoAccounts.customer.email);
    const mine = await customer.agent.get("/api/jobs").expect(200);
    expect(mine.body.jobs.map((j: { title: string }) => j.title)).toEqual([
      demoJobTitles.alcoves,
    ]);
    // The demo plasterer is booked on the alcoves here and on the second workshop's one job.
    const trade = await signIn(t, demoAccounts.trade.email);
    const theirs = await trade.agent.get("/api/jobs").expect(200);
    expect(
      theirs.body.jobs
        .map((j: { title: string; customerName: string | null }) => [
          j.title,
          j.customerName,
        ])
        .sort(),
    ).toEqual(
      [
        [demoJobTitles.alcoves, null],
        [demoSecondWorkshop.jobTitle, null],
      ].sort(),
    );
  });
});

describe("a job as each party sees it", () => {
  it("gives the workshop everything, including internal notes and contacts", async () => {
    const s = await signIn(t, demoAccounts.fitter.email);
    const job = (await s.agent.get(`/api/jobs/${alcovesId}`).expect(200)).body;
    expect(job.siteAddress).toBe("14 Larkspur Terrace, Wetherfold");
    expect(job.tasks).toHaveLength(9);
    const carcasses = job.tasks.find(
      (x: { name: string }) => x.name === "Fix carcasses & scribes",
    );
    expect(carcasses.detail.internalNote).toMatch(/out of plumb/);
    expect(carcasses.detail.caution).toMatch(/Tall units/);
    expect(
      job.parties.find((p: { name: string }) => p.name === "Kestrel Decorating")
        .email,
    ).toBe("nell@kestreldecorating.example.test");
  });

  it("shows a trade with an unanswered booking the area only, their own tasks, and what they wait on by name", async () => {
    const s = await signIn(t, demoAccounts.trade.email);
    const job = (await s.agent.get(`/api/jobs/${alcovesId}`).expect(200)).body;
    // The coving booking is confirmed, so the full address shows (see the next test for before).
    expect(job.area).toBe("Larkspur, Wetherfold");
    expect(job.siteAddress).toBe("14 Larkspur Terrace, Wetherfold");
    const names = job.tasks.map((x: { name: string; detail: unknown }) => [
      x.name,
      x.detail === null,
    ]);
    expect(names).toEqual([
      ["Fix carcasses & scribes", true],
      ["Template coving", false],
      ["Fit coving & make good", false],
    ]);
    expect(
      job.tasks.find((x: { name: string }) => x.name === "Template coving")
        .detail.internalNote,
    ).toBeNull();
    // No other trade's contact details, and only their own bookings.
    expect(
      job.parties
        .filter((p: { kind: string }) => p.kind === "trade")
        .map((p: { name: string }) => p.name),
    ).toEqual(["Ashby Plaster & Coving"]);
    expect(
      new Set(
        job.bookings.map(
          (b: { tradeBusinessName: string }) => b.tradeBusinessName,
        ),
      ),
    ).toEqual(new Set(["Ashby Plaster & Coving"]));
    expect(
      job.parties.find((p: { kind: string }) => p.kind === "customer").phone,
    ).toBeNull();
  });

  it("withholds the full address and access notes from a trade until a booking is confirmed", async () => {
    const m = t.db.ds.manager;
    const plasterer = await m.findOneByOrFail(Trade, {
      businessName: "Ashby Plaster & Coving",
    });
    const confirmed = await m.findOneByOrFail(Booking, {
      tradeId: plasterer.id,
      jobId: alcovesId,
      state: "confirmed",
    });
    await m.update(Booking, { id: confirmed.id }, { state: "sent" });
    try {
      const s = await signIn(t, demoAccounts.trade.email);
      const job = (await s.agent.get(`/api/jobs/${alcovesId}`).expect(200))
        .body;
      expect(job.siteAddress).toBeNull();
      expect(job.postcode).toBeNull();
      expect(job.accessNotes).toBeNull();
      expect(job.area).toBe("Larkspur, Wetherfold");
    } finally {
      await m.update(Booking, { id: confirmed.id }, { state: "confirmed" });
    }
  });

  it("shows the customer visits and what to prepare, without internal notes, cautions or drafts", async () => {
    const s = await signIn(t, demoAccounts.customer.email);
    const job = (await s.agent.get(`/api/jobs/${alcovesId}`).expect(200)).body;
    expect(job.viewerRole).toBe("customer");
    expect(job.siteAddress).toBe("14 Larkspur Terrace, Wetherfold");
    const paint = job.tasks.find(
      (x: { name: string }) => x.name === "Fill, caulk & paint",
    );
    expect(paint.detail.customerNote).toBe(
      "Keep the room free of dust for painting; windows closed.",
    );
    expect(
      job.tasks.every(
        (x: { detail: { internalNote: unknown; caution: unknown } }) =>
          x.detail.internalNote === null && x.detail.caution === null,
      ),
    ).toBe(true);
    expect(
      job.bookings.every((b: { state: string }) => b.state !== "draft"),
    ).toBe(true);
    expect(
      job.parties.filter((p: { email: string | null }) => p.email !== null),
    ).toEqual([]);
  });
});

describe("creating and editing jobs", () => {
  it("creates a job for one of the workshop's customers, with defaults", async () => {
    const s = await signIn(t, demoAccounts.fitter.email);
    const res = await s.agent
      .post(`/api/workshops/${workshopId}/jobs`)
      .set("X-CSRF-Token", s.csrf)
      .send({
        title: "Window seat",
        customerId: rosaId,
        siteAddress: "14 Larkspur Terrace, Wetherfold",
        postcode: "qx4 2lt",
        area: "Larkspur",
        holidayRegion: "GB-ENG",
      });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      title: "Window seat",
      postcode: "QX4 2LT",
      status: "survey",
      version: 1,
      siteWeekdays: [1, 2, 3, 4, 5],
      timeZone: "Europe/London",
    });
  });

  it("refuses a customer of another workshop with a 422 naming the field", async () => {
    const m = t.db.ds.manager;
    const elsewhere = await buildCustomer(
      m,
      await buildWorkshop(m, { name: "Other Workshop" }),
    );
    const s = await signIn(t, demoAccounts.owner.email);
    const res = await s.agent
      .post(`/api/workshops/${workshopId}/jobs`)
      .set("X-CSRF-Token", s.csrf)
      .send({
        title: "X",
        customerId: elsewhere.id,
        siteAddress: "1 Row",
        postcode: "QX1 1AA",
        area: "Row",
        holidayRegion: "GB-ENG",
      });
    expect(res.status).toBe(422);
    expect(res.body.error.fields.customerId).toBeDefined();
  });

  it("names every bad field at once", async () => {
    const s = await signIn(t, demoAccounts.owner.email);
    const res = await s.agent
      .post(`/api/workshops/${workshopId}/jobs`)
      .set("X-CSRF-Token", s.csrf)
      .send({
        title: "",
        customerId: "nope",
        siteAddress: "x",
        postcode: "12345",
        area: "x",
        holidayRegion: "GB-XXX",
        handoverDate: "2026-02-30",
      });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual([
      "customerId",
      "handoverDate",
      "holidayRegion",
      "postcode",
      "title",
    ]);
  });

  it("refuses a stale version with 409 and keeps the other person's change", async () => {
    const a = await signIn(t, demoAccounts.owner.email);
    const b = await signIn(t, demoAccounts.fitter.email);
    const job = (await a.agent.get(`/api/jobs/${alcovesId}`)).body;
    const first = await a.agent
      .patch(`/api/jobs/${alcovesId}`)
      .set("X-CSRF-Token", a.csrf)
      .send({
        version: job.version,
        accessNotes: "Key with neighbour at no. 16",
      });
    expect(first.status).toBe(200);
    expect(first.body.version).toBe(job.version + 1);
    const stale = await b.agent
      .patch(`/api/jobs/${alcovesId}`)
      .set("X-CSRF-Token", b.csrf)
      .send({ version: job.version, accessNotes: "Key safe" });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe("version-conflict");
    expect(stale.body.error.message).toMatch(/Someone else changed this job/);
    const now = (await a.agent.get(`/api/jobs/${alcovesId}`)).body;
    expect(now.accessNotes).toBe("Key with neighbour at no. 16");
  });

  it("lets only the owner delete a job", async () => {
    const owner = await signIn(t, demoAccounts.owner.email);
    const created = await owner.agent
      .post(`/api/workshops/${workshopId}/jobs`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        title: "To remove",
        customerId: rosaId,
        siteAddress: "1 Row",
        postcode: "QX1 1AA",
        area: "Row",
        holidayRegion: "GB-ENG",
      })
      .expect(201);
    const fitter = await signIn(t, demoAccounts.fitter.email);
    await fitter.agent
      .delete(`/api/jobs/${created.body.id}`)
      .set("X-CSRF-Token", fitter.csrf)
      .expect(403);
    await owner.agent
      .delete(`/api/jobs/${created.body.id}`)
      .set("X-CSRF-Token", owner.csrf)
      .expect(204);
    await owner.agent.get(`/api/jobs/${created.body.id}`).expect(404);
  });
});
