// Changing a draft booking (issue 14): PATCH /bookings/:id, only while it is a draft, checked by
// the engine as a new booking is, under the booking locks; the job's version and the booking's
// history move as when the draft was made.
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
} from "../../../tests/factories/demo-scenario";
import { buildTrade } from "../../../tests/factories/builders";
import { createJobFromStarter } from "../../../tests/setup/jobs";
import type {
  BookingOptionsResponse,
  BookingResponse,
  ProgrammeResponse,
} from "../../../shared/schemas";
import { AuditEntry } from "../audit/audit.entity";
import { Job } from "../jobs/jobs.entity";
import { Workshop } from "../workshops/workshops.entity";
import { Trade } from "../trades/trades.entity";
import { Booking } from "./bookings.entity";

let t: TestApp;
let owner: Session;
let alcoves: Job;

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  owner = await signIn(t, demoAccounts.owner.email);
  alcoves = await t.db.ds.manager.findOneByOrFail(Job, {
    title: demoJobTitles.alcoves,
  });
}, 120_000);
afterAll(async () => t?.close());

const send = <T>(req: ReturnType<Session["agent"]["post"]>, body?: T) =>
  req.set("X-CSRF-Token", owner.csrf).send((body ?? {}) as object);

/** A fresh job with a draft booking of the demo plasterer for its coving template, at their first free start. */
async function draftJob(title: string) {
  const jobId = await createJobFromStarter(owner, {
    workshopId: alcoves.workshopId,
    customerId: alcoves.customerId,
    title,
  });
  const p: ProgrammeResponse = (
    await owner.agent.get(`/api/jobs/${jobId}/programme`).expect(200)
  ).body;
  const task = p.tasks.find((x) => x.name === "Template coving")!;
  const options: BookingOptionsResponse = (
    await owner.agent
      .get(`/api/jobs/${jobId}/tasks/${task.id}/booking-options`)
      .expect(200)
  ).body;
  const ashby = options.trades.find(
    (x) => x.businessName === "Ashby Plaster & Coving",
  )!;
  const created = await send(owner.agent.post(`/api/jobs/${jobId}/bookings`), {
    taskId: task.id,
    tradeId: ashby.tradeId,
    start: ashby.firstFree!.start,
    arrivalWindow: "morning",
    send: false,
  }).expect(201);
  return {
    jobId,
    task,
    options,
    booking: created.body as BookingResponse,
  };
}

/** The next weekday after a YYYY-MM-DD date. */
function nextWeekday(date: string, n = 1): string {
  const d = new Date(`${date.slice(0, 10)}T12:00:00Z`);
  while (n > 0) {
    d.setUTCDate(d.getUTCDate() + 1);
    if (d.getUTCDay() !== 0 && d.getUTCDay() !== 6) n--;
  }
  return d.toISOString().slice(0, 10);
}

const version = async (jobId: string) =>
  (await t.db.ds.manager.findOneByOrFail(Job, { id: jobId })).version;

describe("PATCH /bookings/:id on a draft", () => {
  it("changes the start and arrival window, re-plans its finish, records history and audit, moves the job's version", async () => {
    const { jobId, booking } = await draftJob("Draft edit: dates");
    const v = await version(jobId);
    const later = nextWeekday(booking.start, 3);
    const res = await send(owner.agent.patch(`/api/bookings/${booking.id}`), {
      start: `${later}T12:00`,
      arrivalWindow: "afternoon",
    }).expect(200);
    const b = res.body as BookingResponse;
    expect(b.state).toBe("draft");
    expect(b.start).toBe(`${later}T12:00`);
    expect(b.arrivalWindow).toBe("afternoon");
    expect(b.finish > b.start).toBe(true);
    expect(b.sequence).toBe(0);
    expect(b.history.at(-1)).toMatchObject({
      fromState: "draft",
      toState: "draft",
      who: demoAccounts.owner.name,
    });
    expect(b.history.at(-1)!.note).toMatch(/^Draft changed: /);
    expect(await version(jobId)).toBe(v + 1);
    const audit = await t.db.ds.manager.findBy(AuditEntry, {
      action: "booking.updated",
      entityId: booking.id,
    });
    expect(audit).toHaveLength(1);
    expect(audit[0].detail).toMatchObject({ jobId, toVersion: v + 1 });
    // Nothing was sent: no e-mail to the trade for a draft.
    const row = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: booking.id,
    });
    expect(row.sentAt).toBeNull();
    // And it sends afterwards as any draft does, at the new start.
    const sent = await send(
      owner.agent.post(`/api/bookings/${booking.id}/send`),
    ).expect(200);
    expect(sent.body.start).toBe(`${later}T12:00`);
  });

  it("moves a draft to another trade of the task's kind, and refuses one of another kind (422)", async () => {
    const { booking } = await draftJob("Draft edit: trade");
    const workshop = await t.db.ds.manager.findOneByOrFail(Workshop, {
      id: alcoves.workshopId,
    });
    const other = await buildTrade(t.db.ds.manager, workshop, {
      kind: "plasterer",
      businessName: "Second Plasterers",
    });
    const res = await send(owner.agent.patch(`/api/bookings/${booking.id}`), {
      tradeId: other.id,
    }).expect(200);
    expect(res.body.tradeBusinessName).toBe("Second Plasterers");
    expect(res.body.history.at(-1).note).toContain(
      "trade Ashby Plaster & Coving → Second Plasterers",
    );
    const decorator = await t.db.ds.manager.findOneByOrFail(Trade, {
      workshopId: alcoves.workshopId,
      kind: "decorator",
    });
    const wrong = await send(owner.agent.patch(`/api/bookings/${booking.id}`), {
      tradeId: decorator.id,
    }).expect(422);
    expect(wrong.body.error.fields.tradeId).toEqual([
      "Choose a trade of the task's kind",
    ]);
  });

  it("refuses a start on the trade's day off with their next free start (409), unless a reason is given", async () => {
    const { jobId, booking } = await draftJob("Draft edit: clash");
    const day = nextWeekday(booking.start, 2);
    const ashby = await t.db.ds.manager.findOneByOrFail(Trade, {
      id: booking.tradeId,
    });
    await t.db.ds.manager.update(
      Trade,
      { id: ashby.id },
      { daysOff: [...ashby.daysOff, day] },
    );
    const v = await version(jobId);
    const res = await send(owner.agent.patch(`/api/bookings/${booking.id}`), {
      start: day,
    }).expect(409);
    expect(res.body.error.fields.start.length).toBeGreaterThan(0);
    expect(res.body.error.message).toMatch(/next free start is/);
    expect(await version(jobId)).toBe(v);
    const anyway = await send(
      owner.agent.patch(`/api/bookings/${booking.id}`),
      { start: day, overrideReason: "Dev agreed to come in on his day off" },
    ).expect(200);
    expect(anyway.body.overrideReason).toBe(
      "Dev agreed to come in on his day off",
    );
    expect(anyway.body.start.slice(0, 10)).toBe(day);
  });

  it("refuses an arrival range that ends before it starts (400)", async () => {
    const { booking } = await draftJob("Draft edit: range");
    const res = await send(owner.agent.patch(`/api/bookings/${booking.id}`), {
      arrivalWindow: "range",
      arrivalFrom: "11:00",
      arrivalTo: "09:00",
    }).expect(400);
    expect(res.body.error.fields).toHaveProperty("arrivalFrom");
  });

  it("refuses once the booking is sent or cancelled (409, in words), changing nothing", async () => {
    const { booking } = await draftJob("Draft edit: sent");
    await send(owner.agent.post(`/api/bookings/${booking.id}/send`)).expect(
      200,
    );
    const res = await send(owner.agent.patch(`/api/bookings/${booking.id}`), {
      arrivalWindow: "all-day",
    }).expect(409);
    expect(res.body.error.message).toBe(
      "This booking was sent, so it is no longer a draft to change. Cancel it and book again, or move it on the programme (the trade is asked to confirm again).",
    );
    const row = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: booking.id,
    });
    expect(row.arrivalWindow).toBe("morning");

    const second = await draftJob("Draft edit: cancelled");
    await send(owner.agent.post(`/api/bookings/${second.booking.id}/cancel`), {
      reason: "Customer postponed",
    }).expect(200);
    const cancelled = await send(
      owner.agent.patch(`/api/bookings/${second.booking.id}`),
      { arrivalWindow: "all-day" },
    ).expect(409);
    expect(cancelled.body.error.message).toMatch(/^This booking was cancelled/);
  });
});
