// Issue 13, item 3: a trade is never double-booked. Two bookings of one trade for the same
// half-day on two jobs, sent at the same moment: exactly one is booked, the other gets the same
// clash answer (with the next free start) it would get one after the other. Bookings are
// serialised per trade — and per person, when one trade user speaks for several workshops'
// trade records (the locking rule in server/db/locks.ts).
import { In } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../../tests/setup/test-app";
import {
  DEMO_PASSWORD,
  demoAccounts,
  demoJobTitles,
} from "../../../tests/factories/demo-scenario";
import {
  buildCustomer,
  buildJob,
  buildMember,
  buildTask,
  buildTrade,
  buildUser,
  buildWorkshop,
  linkTradeUser,
} from "../../../tests/factories/builders";
import { createJobFromStarter } from "../../../tests/setup/jobs";
import type { ProgrammeResponse } from "../../../shared/schemas";
import { PINNING_STATES } from "../programme/programme-input";
import { Job } from "../jobs/jobs.entity";
import { Trade } from "../trades/trades.entity";
import { User } from "../users/users.entity";
import { Booking } from "./bookings.entity";

let t: TestApp;
let owner: Session;
let alcoves: Job;
let ashby: Trade;

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  owner = await signIn(t, demoAccounts.owner.email);
  alcoves = await t.db.ds.manager.findOneByOrFail(Job, {
    title: demoJobTitles.alcoves,
  });
  ashby = await t.db.ds.manager.findOneByOrFail(Trade, {
    businessName: "Ashby Plaster & Coving",
    workshopId: alcoves.workshopId,
  });
}, 120_000);
afterAll(async () => t?.close());

const ROUNDS = 4;

/** A new alcove job of the demo workshop and its coving template task. */
async function covingTask(
  title: string,
): Promise<{ jobId: string; taskId: string }> {
  const jobId = await createJobFromStarter(owner, {
    workshopId: alcoves.workshopId,
    customerId: alcoves.customerId,
    title,
  });
  const p: ProgrammeResponse = (
    await owner.agent.get(`/api/jobs/${jobId}/programme`).expect(200)
  ).body;
  return {
    jobId,
    taskId: p.tasks.find((x) => x.name === "Template coving")!.id,
  };
}

/** The plasterer's first free start for a task, as the booking form offers it. */
async function firstFree(
  jobId: string,
  taskId: string,
  tradeId: string,
): Promise<string> {
  const res = await owner.agent
    .get(`/api/jobs/${jobId}/tasks/${taskId}/booking-options`)
    .expect(200);
  return res.body.trades.find((x: { tradeId: string }) => x.tradeId === tradeId)
    .firstFree.start;
}

const send = (
  s: Session,
  jobId: string,
  taskId: string,
  tradeId: string,
  start: string,
) =>
  s.agent
    .post(`/api/jobs/${jobId}/bookings`)
    .set("X-CSRF-Token", s.csrf)
    .send({
      taskId,
      tradeId,
      start,
      arrivalWindow: start.endsWith("T12:00") ? "afternoon" : "morning",
    });

type Answer = Awaited<ReturnType<typeof send>>;

/** One round's outcome: exactly one booked (201), the other the clash answer with a later next free start. */
function expectOneBooked(round: number, start: string, answers: Answer[]) {
  const statuses = answers.map((a) => a.status).sort();
  expect(statuses, `round ${round}: statuses`).toEqual([201, 409]);
  const refused = answers.find((a) => a.status === 409)!;
  expect(refused.body.error.code).toBe("conflict");
  expect(refused.body.error.message).toMatch(
    /already booked|busy for another workshop/,
  );
  expect(refused.body.error.message).toMatch(/Their next free start is/);
  expect(refused.body.error.fields.nextFreeStart[0] > start).toBe(true);
}

/** The trade records' bookings that hold `start` (sent, confirmed…), across workshops. */
const holding = (tradeIds: string[], start: string) =>
  t.db.ds.manager.countBy(Booking, {
    tradeId: In(tradeIds),
    start,
    state: In([...PINNING_STATES]),
  });

describe("two sends for one trade's half-day at the same moment", () => {
  it(`books exactly one in each of ${ROUNDS} rounds; the other gets the clash answer`, async () => {
    const rounds: string[] = [];
    for (let round = 1; round <= ROUNDS; round++) {
      const a = await covingTask(`Race ${round} A`);
      const b = await covingTask(`Race ${round} B`);
      const start = await firstFree(a.jobId, a.taskId, ashby.id);
      const answers = await Promise.all([
        send(owner, a.jobId, a.taskId, ashby.id, start),
        send(owner, b.jobId, b.taskId, ashby.id, start),
      ]);
      rounds.push(answers.map((x) => x.status).join("+"));
      expectOneBooked(round, start, answers);
      expect(await holding([ashby.id], start)).toBe(1);
    }
    console.log(
      `two simultaneous sends, ${ROUNDS} rounds: ${rounds.join(", ")}`,
    );
  }, 120_000);

  it("also when the trade's person is booked at once by another workshop, through its own record of them", async () => {
    const m = t.db.ds.manager;
    const dev = await m.findOneByOrFail(User, {
      email: demoAccounts.trade.email,
    });
    const other = await buildWorkshop(m, { name: "Race Joinery" });
    const otherOwner = await buildUser(m, {
      email: "owner@racejoinery.example.test",
      name: "Rae Owner",
      password: DEMO_PASSWORD,
    });
    await buildMember(m, other, otherOwner, "owner");
    const theirRecord = await buildTrade(m, other, {
      kind: "plasterer",
      businessName: "Ashby Plaster & Coving",
      email: demoAccounts.trade.email,
    });
    await linkTradeUser(m, theirRecord, dev);
    const theirs = await signIn(t, "owner@racejoinery.example.test");
    const rounds: string[] = [];
    for (let round = 1; round <= ROUNDS; round++) {
      const here = await covingTask(`Two workshops ${round}`);
      const theirJob = await buildJob(m, other, await buildCustomer(m, other));
      const theirTask = await buildTask(m, theirJob, {
        name: "Run cornice",
        party: "plasterer",
        durationDays: 0.5,
      });
      const start = await firstFree(here.jobId, here.taskId, ashby.id);
      const answers = await Promise.all([
        send(owner, here.jobId, here.taskId, ashby.id, start),
        send(theirs, theirJob.id, theirTask.id, theirRecord.id, start),
      ]);
      rounds.push(answers.map((x) => x.status).join("+"));
      expectOneBooked(round, start, answers);
      expect(await holding([ashby.id, theirRecord.id], start)).toBe(1);
    }
    console.log(
      `two workshops sending for one person at once, ${ROUNDS} rounds: ${rounds.join(", ")}`,
    );
  }, 120_000);

  it("sends only one of two drafts for the same half-day, even sent at once", async () => {
    const a = await covingTask("Drafts A");
    const b = await covingTask("Drafts B");
    const start = await firstFree(a.jobId, a.taskId, ashby.id);
    // Drafts hold no dates, so both are made; the send is where the slot is taken.
    const draft = async (x: { jobId: string; taskId: string }) =>
      (
        await owner.agent
          .post(`/api/jobs/${x.jobId}/bookings`)
          .set("X-CSRF-Token", owner.csrf)
          .send({
            taskId: x.taskId,
            tradeId: ashby.id,
            start,
            arrivalWindow: start.endsWith("T12:00") ? "afternoon" : "morning",
            send: false,
          })
          .expect(201)
      ).body.id as string;
    const ids = [await draft(a), await draft(b)];
    const answers = await Promise.all(
      ids.map((id) =>
        owner.agent
          .post(`/api/bookings/${id}/send`)
          .set("X-CSRF-Token", owner.csrf),
      ),
    );
    expect(answers.map((x) => x.status).sort()).toEqual([200, 409]);
    const refused = answers.find((x) => x.status === 409)!;
    expect(refused.body.error.message).toMatch(/already booked/);
    expect(refused.body.error.fields.nextFreeStart[0] > start).toBe(true);
    expect(await holding([ashby.id], start)).toBe(1);
  });

  it("refuses to accept a proposed start the trade is already booked for", async () => {
    const a = await covingTask("Proposal A");
    const b = await covingTask("Proposal B");
    const startA = await firstFree(a.jobId, a.taskId, ashby.id);
    expect(
      (await send(owner, a.jobId, a.taskId, ashby.id, startA)).status,
    ).toBe(201);
    const startB = await firstFree(b.jobId, b.taskId, ashby.id);
    const booked = await send(owner, b.jobId, b.taskId, ashby.id, startB);
    expect(booked.status).toBe(201);
    // The trade, asked for job B, proposes the morning they are already giving job A.
    await owner.agent
      .post(`/api/bookings/${booked.body.id}/answer`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        answer: "propose",
        channel: "phone",
        proposedStart: startA.slice(0, 10),
      })
      .expect(200);
    const accept = await owner.agent
      .post(`/api/bookings/${booked.body.id}/proposal`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ accept: true });
    expect(accept.status).toBe(409);
    expect(accept.body.error.message).toMatch(/already booked/);
    expect(accept.body.error.fields.nextFreeStart).toHaveLength(1);
    // Nothing moved: job B's booking still holds its own start, still waiting on the proposal.
    const row = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: booked.body.id,
    });
    expect([row.start, row.state]).toEqual([startB, "date-proposed"]);
  });
});
