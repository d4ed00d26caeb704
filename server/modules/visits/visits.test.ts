// A trade's visits (issue 8, trade part): one person speaking for trade records in two workshops,
// what they see of each booking, and the actions they may take on their own bookings only.
import { whenWords } from "../bookings/booking-notices";
import { In } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../../tests/setup/test-app";
import {
  buildBooking,
  buildCustomer,
  buildJob,
  buildLink,
  buildMember,
  buildTask,
  buildTrade,
  buildUser,
  buildWorkshop,
  linkTradeUser,
} from "../../../tests/factories/builders";
import {
  DEMO_PASSWORD,
  demoAccounts,
  demoJobTitles,
  DEMO_WORKSHOP_NAME,
} from "../../../tests/factories/demo-scenario";
import {
  DEMO_DRAWING_TITLE,
  loadDemoDrawings,
} from "../../../tests/factories/demo-drawings";
import { OutboxMessage } from "../../infra/outbox/outbox.entity";
import { Booking } from "../bookings/bookings.entity";
import { Job } from "../jobs/jobs.entity";
import { localToday } from "../jobs/jobs.presenter";
import { Task } from "../programme/programme.entity";
import { ThreadMessage } from "../thread/thread.entity";
import { Trade } from "../trades/trades.entity";
import { Workshop } from "../workshops/workshops.entity";
import type { Visit } from "../../../shared/schemas";

let t: TestApp;
let kit: Session;
// Two workshops, one person (Kit Farrow) with a trade record in each.
const f = {} as {
  jobA: Job;
  jobB: Job;
  skim: Task;
  paint: Task;
  coving: Task;
  mine: Booking; // A, confirmed
  theirs: Booking; // A, the decorator's, confirmed
  elsewhere: Booking; // B, sent
  draft: Booking; // B, draft
  cancelled: Booking; // A, cancelled
  ownerB: string;
};

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  const m = t.db.ds.manager;
  const workshopA = await m.findOneByOrFail(Workshop, {
    name: DEMO_WORKSHOP_NAME,
  });
  const workshopB = await buildWorkshop(m, { name: "Weir Street Cabinets" });
  const ownerB = await buildUser(m, {
    email: "ivy@weirstreet.example.test",
    name: "Ivy Weir",
    password: DEMO_PASSWORD,
  });
  await buildMember(m, workshopB, ownerB, "owner");
  f.ownerB = ownerB.email;
  const user = await buildUser(m, {
    email: "kit@farrowplaster.example.test",
    name: "Kit Farrow",
    password: DEMO_PASSWORD,
  });
  const inA = await buildTrade(m, workshopA, {
    kind: "plasterer",
    businessName: "Farrow Plastering",
    email: "kit@farrowplaster.example.test",
  });
  const inB = await buildTrade(m, workshopB, {
    kind: "plasterer",
    businessName: "Farrow Plastering",
    email: "kit@farrowplaster.example.test",
  });
  await linkTradeUser(m, inA, user);
  await linkTradeUser(m, inB, user);
  const decorator = await m.findOneByOrFail(Trade, {
    businessName: "Kestrel Decorating",
  });
  const custA = await buildCustomer(m, workshopA);
  f.jobA = await buildJob(m, workshopA, custA, {
    title: "Visits job A",
    area: "Larch Row, Wetherfold",
    siteAddress: "9 Larch Row, Wetherfold",
    postcode: "QX3 9LR",
    handoverDate: "2027-04-30",
  });
  const custB = await buildCustomer(m, workshopB);
  f.jobB = await buildJob(m, workshopB, custB, {
    title: "Visits job B",
    area: "Weir, Wetherfold",
    siteAddress: "2 Weir Street, Wetherfold",
    postcode: "QX2 2WS",
  });
  f.skim = await buildTask(m, f.jobA, {
    name: "Skim ceiling",
    party: "plasterer",
    internalNote: "Quote was tight: keep to one day",
  });
  f.paint = await buildTask(m, f.jobA, {
    name: "Paint ceiling",
    party: "decorator",
  });
  await buildLink(m, f.skim, f.paint);
  f.coving = await buildTask(m, f.jobB, {
    name: "Run coving",
    party: "plasterer",
  });
  const cornice = await buildTask(m, f.jobB, {
    name: "Repair cornice",
    party: "plasterer",
  });
  // Mon 5 Apr 2027 (after Easter Monday, 29 Mar): an ordinary working week.
  f.mine = await buildBooking(m, f.skim, inA, {
    state: "confirmed",
    start: "2027-04-05T08:00",
    finish: "2027-04-05T16:30",
  });
  f.theirs = await buildBooking(m, f.paint, decorator, {
    state: "confirmed",
    start: "2027-04-06T08:00",
    finish: "2027-04-06T16:30",
  });
  f.elsewhere = await buildBooking(m, f.coving, inB, {
    state: "sent",
    start: "2027-04-06T08:00",
    finish: "2027-04-06T16:30",
    arrivalWindow: "range",
    arrivalFrom: "08:00",
    arrivalTo: "09:00",
  });
  f.draft = await buildBooking(m, cornice, inB, {
    state: "draft",
    start: "2027-04-08T08:00",
    finish: "2027-04-08T16:30",
  });
  const oldTask = await buildTask(m, f.jobA, {
    name: "Patch hallway",
    party: "plasterer",
  });
  f.cancelled = await buildBooking(m, oldTask, inA, {
    state: "cancelled",
    start: "2027-04-12T08:00",
    finish: "2027-04-12T16:30",
  });
  await loadDemoDrawings(
    t.db.ds,
    t.storage,
    demoJobTitles.alcoves,
    demoAccounts.owner.email,
  );
  kit = await signIn(t, "kit@farrowplaster.example.test");
}, 120_000);
afterAll(async () => t?.close());

const post = (s: Session, path: string, body?: object) =>
  s.agent
    .post(path)
    .set("X-CSRF-Token", s.csrf)
    .send(body ?? {});

async function myVisits(
  s: Session,
): Promise<{ body: { upcoming: Visit[]; past: Visit[] } }> {
  const res = await s.agent.get("/api/me/visits").expect(200);
  return { body: res.body };
}

// Other trades' contact details, internal notes: never in anything a trade is sent.
const forbiddenText = [
  "nell@kestreldecorating.example.test",
  "01632 960 271",
  "Nell Brook",
  "Quote was tight",
  "out of plumb",
  "Sprayed doors",
];

describe("GET /me/visits", () => {
  it("lists the person's visits across both workshops, each with its workshop, dates, window, state and readiness", async () => {
    const res = await myVisits(kit);
    const up = res.body.upcoming;
    expect(up.map((v) => v.bookingId)).toEqual([f.mine.id, f.elsewhere.id]);
    const [a, b] = up;
    expect(a).toMatchObject({
      workshopName: "Hollin & Vane Joinery",
      jobTitle: "Visits job A",
      jobArea: "Larch Row, Wetherfold",
      taskName: "Skim ceiling",
      state: "confirmed",
      start: "2027-04-05T08:00",
      arrivalWindow: "all-day",
      // Confirmed: the full address is theirs now.
      siteAddress: "9 Larch Row, Wetherfold, QX3 9LR",
      readiness: { state: "clear", clearFrom: "2027-04-05T08:00" },
      can: {
        answer: true,
        markStarted: true,
        markDone: false,
        runningLate: true,
        extend: true,
        upload: true,
      },
    });
    expect(b).toMatchObject({
      workshopName: "Weir Street Cabinets",
      jobTitle: "Visits job B",
      taskName: "Run coving",
      state: "sent",
      arrivalWindow: "range",
      arrivalFrom: "08:00",
      arrivalTo: "09:00",
      // Not confirmed: the area only, never the customer's address.
      siteAddress: null,
      can: { answer: true, markStarted: false, runningLate: false },
    });
    expect(JSON.stringify(res.body)).not.toContain("2 Weir Street");
    // The draft was never offered to them; the cancelled one is below, with the past.
    const all = [...up, ...res.body.past].map((v) => v.bookingId);
    expect(all).not.toContain(f.draft.id);
    expect(res.body.past.map((v) => v.bookingId)).toEqual([f.cancelled.id]);
    expect(res.body.past[0].can).toEqual({
      answer: false,
      markStarted: false,
      markDone: false,
      runningLate: false,
      extend: false,
      upload: false,
    });
    // Never the other trade on job A (the decorator): not as a visit, not their details.
    expect(all).not.toContain(f.theirs.id);
    for (const text of forbiddenText)
      expect(JSON.stringify(res.body)).not.toContain(text);
  });

  it("gives the engine's readiness: the demo plasterer's template waits on the carcasses, planned as the programme says", async () => {
    const dev = await signIn(t, demoAccounts.trade.email);
    const { body } = await myVisits(dev);
    const alcoves = await t.db.ds.manager.findOneByOrFail(Job, {
      title: demoJobTitles.alcoves,
    });
    const owner = await signIn(t, demoAccounts.owner.email);
    const programme = (
      await owner.agent.get(`/api/jobs/${alcoves.id}/programme`).expect(200)
    ).body;
    const idOf = (name: string) =>
      programme.tasks.find((x: { name: string }) => x.name === name).id;
    const planned = (name: string) =>
      programme.result.tasks.find((x: { id: string }) => x.id === idOf(name));
    const template = body.upcoming.find(
      (v) => v.taskName === "Template coving",
    );
    const coving = body.upcoming.find(
      (v) => v.taskName === "Fit coving & make good",
    );
    expect(template).toMatchObject({
      workshopName: "Hollin & Vane Joinery",
      jobTitle: demoJobTitles.alcoves,
      jobArea: "Larkspur, Wetherfold",
      state: "sent",
      // One address rule (issue 16): confirmed for the coving on this job, they know the address.
      siteAddress: "14 Larkspur Terrace, Wetherfold, QX4 2LT",
      arrivalWindow: "morning",
      readiness: {
        state: "waiting",
        clearFrom: null,
        waitingOn: [
          {
            name: "Fix carcasses & scribes",
            plannedFinish: planned("Fix carcasses & scribes").plannedFinish,
          },
        ],
      },
    });
    // The engine's allowsFrom for the same wait.
    expect(template!.readiness.waitingOn[0].allowsFrom).toBe(
      planned("Template coving").readiness.waitingOn[0].allowsFrom,
    );
    expect(coving).toMatchObject({
      state: "confirmed",
      siteAddress: "14 Larkspur Terrace, Wetherfold, QX4 2LT",
      arrivalFrom: "08:00",
      arrivalTo: "09:00",
      readiness: {
        state: "waiting",
        waitingOn: [{ name: "Template coving" }],
      },
    });
    // The drawings for them: the elevation shared with plasterers, linked to both coving tasks.
    expect(template!.drawings).toEqual([
      expect.objectContaining({
        title: DEMO_DRAWING_TITLE,
        kind: "drawing",
        currentRevision: "A",
        forThisTask: true,
      }),
    ]);
    // Kit (a plasterer of the same workshop, not on the alcove job) sees no drawing of it.
    const kitVisits = await myVisits(kit);
    expect(JSON.stringify(kitVisits.body)).not.toContain(DEMO_DRAWING_TITLE);
    // Tasks at height carry the caution.
    expect(template!.caution).toMatch(/Work at height/);
    for (const text of [...forbiddenText, "Brightwire", "sam@brightwire"])
      expect(JSON.stringify(body)).not.toContain(text);
  });

  it("is empty for someone who speaks for no trade", async () => {
    const owner = await signIn(t, demoAccounts.owner.email);
    const { body } = await myVisits(owner);
    expect(body).toEqual({ upcoming: [], past: [] });
  });
});

describe("GET /visits/:bookingId", () => {
  it("shows their own visit with the confirmation page's content, and nothing of other trades", async () => {
    const res = await kit.agent.get(`/api/visits/${f.mine.id}`).expect(200);
    expect(res.body.visit.bookingId).toBe(f.mine.id);
    expect(res.body.page).toMatchObject({
      status: "current",
      workshopName: "Hollin & Vane Joinery",
      tradeBusinessName: "Farrow Plastering",
      taskName: "Skim ceiling",
      jobArea: "Larch Row, Wetherfold",
      siteAddress: "9 Larch Row, Wetherfold, QX3 9LR",
      state: "confirmed",
      canAnswer: true,
      waitsOn: [],
    });
    for (const text of forbiddenText) expect(res.text).not.toContain(text);
  });

  it("answers 404 for another trade's visit, a draft and an unknown id; 403 for the workshop", async () => {
    for (const id of [
      f.theirs.id,
      f.draft.id,
      "00000000-0000-4000-8000-000000000000",
    ]) {
      const res = await kit.agent.get(`/api/visits/${id}`).expect(404);
      expect(res.body.error.code).toBe("not-found");
    }
    const owner = await signIn(t, demoAccounts.owner.email);
    await owner.agent.get(`/api/visits/${f.mine.id}`).expect(403);
  });
});

describe("actions only on their own bookings", () => {
  it("refuses every action on another trade's booking with 404, and changes nothing", async () => {
    const before = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: f.theirs.id,
    });
    const base = `/api/visits/${f.theirs.id}`;
    await post(kit, `${base}/answer`, {
      answer: "decline",
      reason: "x",
    }).expect(404);
    await post(kit, `${base}/progress`, { mark: "started" }).expect(404);
    await post(kit, `${base}/running-late`, { arrivalTime: "10:00" }).expect(
      404,
    );
    await post(kit, `${base}/extend/preview`).expect(404);
    await post(kit, `${base}/extend`, { version: 1 }).expect(404);
    const after = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: f.theirs.id,
    });
    expect(after.state).toBe(before.state);
    expect(after.finish).toBe(before.finish);
    const paint = await t.db.ds.manager.findOneByOrFail(Task, {
      id: f.paint.id,
    });
    expect(paint.actualStart).toBeNull();
  });

  it("progress and running late need a confirmed booking (409 on a sent one)", async () => {
    const base = `/api/visits/${f.elsewhere.id}`;
    const r1 = await post(kit, `${base}/progress`, { mark: "started" }).expect(
      409,
    );
    expect(r1.body.error.message).toMatch(/Confirm this booking first/);
    await post(kit, `${base}/running-late`, { arrivalTime: "10:00" }).expect(
      409,
    );
    await post(kit, `${base}/progress`, { mark: "sometime" }).expect(400);
  });
});

describe("answering signed in", () => {
  it("confirms through the one answer path and tells that workshop by e-mail", async () => {
    const res = await post(kit, `/api/visits/${f.elsewhere.id}/answer`, {
      answer: "confirm",
    }).expect(200);
    expect(res.body.visit.state).toBe("confirmed");
    expect(res.body.page.siteAddress).toBe(
      "2 Weir Street, Wetherfold, QX2 2WS",
    );
    const b = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: f.elsewhere.id,
    });
    expect(b.state).toBe("confirmed");
    const mail = await t.db.ds.manager.findBy(OutboxMessage, { to: f.ownerB });
    // The notice names the visit's day and arrival (issue 16).
    expect(mail.map((x) => x.subject)).toContain(
      `Farrow Plastering confirmed Run coving, ${whenWords(b)}: Visits job B.`,
    );
    // Workshop A heard nothing of workshop B's booking.
    const toA = await t.db.ds.manager.findBy(OutboxMessage, {
      to: In([demoAccounts.owner.email, demoAccounts.fitter.email]),
    });
    expect(toA.some((x) => x.subject.includes("Run coving"))).toBe(false);
  });
});

describe("running late", () => {
  it("records the new arrival time, notes it in the trades & workshop thread and e-mails the workshop", async () => {
    const res = await post(kit, `/api/visits/${f.mine.id}/running-late`, {
      arrivalTime: "10:30",
      note: "Van at the tyre place",
    }).expect(200);
    expect(res.body.runningLate).toMatchObject({
      day: "2027-04-05",
      arrivalTime: "10:30",
    });
    const notes = await t.db.ds.manager.findBy(ThreadMessage, {
      jobId: f.jobA.id,
      kind: "system",
    });
    const note = notes.find((n) => n.text.includes("running late"));
    expect(note?.audience).toBe("trades");
    expect(note?.text).toBe(
      "Farrow Plastering is running late for Skim ceiling: now arriving 10:30 on Mon 5 Apr.",
    );
    // Their own words reach the workshop (the e-mail and the booking's history), not the trades.
    expect(notes.some((n) => n.text.includes("tyre place"))).toBe(false);
    const mail = await t.db.ds.manager.findBy(OutboxMessage, {
      to: In([demoAccounts.owner.email, demoAccounts.fitter.email]),
    });
    const late = mail.filter((x) => x.subject.includes("running late"));
    expect(late.map((x) => x.to).sort()).toEqual(
      [demoAccounts.fitter.email, demoAccounts.owner.email].sort(),
    );
    expect(late[0].subject).toContain("now arriving 10:30 on Mon 5 Apr");
    // The booking's history shows it for the workshop.
    const owner = await signIn(t, demoAccounts.owner.email);
    const bookings = (
      await owner.agent.get(`/api/jobs/${f.jobA.id}/bookings`).expect(200)
    ).body.bookings;
    const mine = bookings.find((x: { id: string }) => x.id === f.mine.id);
    expect(mine.history.at(-1).note).toMatch(
      /^Running late: now arriving 10:30 .*“Van at the tyre place”$/,
    );
    expect(late[0].text).toContain("Van at the tyre place");
    await post(kit, `/api/visits/${f.mine.id}/running-late`, {
      arrivalTime: "25:00",
    }).expect(400);
  });

  it("the trade reads the thread without the workshop-only messages", async () => {
    const owner = await signIn(t, demoAccounts.owner.email);
    await post(owner, `/api/jobs/${f.jobA.id}/thread/messages`, {
      audience: "workshop",
      text: "Margin on this job is thin",
    }).expect(201);
    const thread = await kit.agent
      .get(`/api/jobs/${f.jobA.id}/thread`)
      .expect(200);
    const texts: string[] = thread.body.messages.map(
      (x: { text: string }) => x.text,
    );
    expect(texts.some((x) => x.includes("running late"))).toBe(true);
    expect(texts).not.toContain("Margin on this job is thin");
  });
});

describe("need another day", () => {
  it("previews the knock-on (tasks that move, re-confirmations, handover, the clash elsewhere) without saving", async () => {
    const res = await post(
      kit,
      `/api/visits/${f.mine.id}/extend/preview`,
    ).expect(200);
    const p = res.body;
    expect(p).toMatchObject({
      taskName: "Skim ceiling",
      fromFinish: "2027-04-05T16:30",
      toFinish: "2027-04-06T16:30",
      handover: { date: "2027-04-30" },
    });
    // The decorator's task is booked, so it moves only once they confirm its new start.
    expect(p.moves).toEqual([]);
    expect(p.reconfirm).toEqual([
      {
        taskName: "Paint ceiling",
        proposedStart: expect.stringMatching(/^2027-04-07/),
      },
    ]);
    // Tue 6 Apr is booked with the other workshop: shown only as busy there.
    expect(p.problems.join(" ")).toMatch(/busy for another workshop/);
    expect(res.text).not.toContain("Visits job B");
    expect(res.text).not.toContain("Kestrel");
    const task = await t.db.ds.manager.findOneByOrFail(Task, { id: f.skim.id });
    expect(Number(task.durationDays)).toBe(1);
  });

  it("applies it at the version seen: a stale version is 409; the task grows a day, the decorator must re-confirm, the workshop is told", async () => {
    const preview = (
      await post(kit, `/api/visits/${f.mine.id}/extend/preview`).expect(200)
    ).body;
    const stale = await post(kit, `/api/visits/${f.mine.id}/extend`, {
      version: preview.version + 5,
    }).expect(409);
    expect(stale.body.error.code).toBe("version-conflict");

    const res = await post(kit, `/api/visits/${f.mine.id}/extend`, {
      version: preview.version,
    }).expect(200);
    expect(res.body.impact.toFinish).toBe("2027-04-06T16:30");
    expect(res.body.visit).toMatchObject({
      durationDays: 2,
      finish: "2027-04-06T16:30",
      state: "confirmed",
    });
    const m = t.db.ds.manager;
    expect(
      Number((await m.findOneByOrFail(Task, { id: f.skim.id })).durationDays),
    ).toBe(2);
    const mine = await m.findOneByOrFail(Booking, { id: f.mine.id });
    expect(mine.sequence).toBe(f.mine.sequence + 1);
    const theirs = await m.findOneByOrFail(Booking, { id: f.theirs.id });
    expect(theirs.state).toBe("needs-reconfirming");
    expect(theirs.start).toBe(preview.reconfirm[0].proposedStart);
    // The decorator got the updated invitation from the existing re-confirm path.
    const toDecorator = await m.findBy(OutboxMessage, {
      to: "nell@kestreldecorating.example.test",
    });
    expect(toDecorator.some((x) => x.subject.includes("Paint ceiling"))).toBe(
      true,
    );
    const notes = await m.findBy(ThreadMessage, {
      jobId: f.jobA.id,
      kind: "system",
    });
    expect(
      notes.find((n) =>
        n.text.startsWith("Farrow Plastering needs another day"),
      )?.text,
    ).toBe(
      "Farrow Plastering needs another day for Skim ceiling: now until Tue 6 Apr. Paint ceiling needs re-confirming.",
    );
    const mail = await m.findBy(OutboxMessage, {
      to: demoAccounts.owner.email,
    });
    expect(mail.some((x) => x.subject.includes("needs another day"))).toBe(
      true,
    );
    // They get the invitation as it now stands, confirmed, at the raised SEQUENCE, so a later
    // reply from their calendar app is not refused as out of date (issue 16).
    const trade = await m.findOneByOrFail(Trade, { id: f.mine.tradeId });
    const toThem = (await m.findBy(OutboxMessage, { to: trade.email })).filter(
      (x) =>
        x.subject.includes("is confirmed for") &&
        x.calendar?.content.includes(`\r\nUID:${mine.icalUid}\r\n`) &&
        x.calendar.content.includes(`\r\nSEQUENCE:${mine.sequence}\r\n`),
    );
    expect(toThem.length).toBe(1);
    expect(toThem[0].text).toContain("Nothing more to do");
    const job = await m.findOneByOrFail(Job, { id: f.jobA.id });
    expect(job.version).toBe(preview.version + 1);
  });
});

describe("marking their own task started and done", () => {
  it("sets the actual dates in the job's time zone, notes it for the whole job, and moves the visit to the past when done", async () => {
    const today = localToday("Europe/London");
    const started = await post(kit, `/api/visits/${f.mine.id}/progress`, {
      mark: "started",
    }).expect(200);
    expect(started.body).toMatchObject({
      progress: "started",
      readiness: { state: "started" },
      can: { markStarted: false, markDone: true, answer: false },
    });
    const m = t.db.ds.manager;
    const task = await m.findOneByOrFail(Task, { id: f.skim.id });
    expect(task.actualStart?.slice(0, 10)).toBe(today);
    await post(kit, `/api/visits/${f.mine.id}/progress`, {
      mark: "started",
    }).expect(409);
    // Started, so no more answering: that goes through the thread now.
    await post(kit, `/api/visits/${f.mine.id}/answer`, {
      answer: "confirm",
    }).expect(409);
    const done = await post(kit, `/api/visits/${f.mine.id}/progress`, {
      mark: "done",
    }).expect(200);
    expect(done.body.progress).toBe("done");
    const notes = await m.findBy(ThreadMessage, {
      jobId: f.jobA.id,
      kind: "system",
    });
    const started_ = notes.find((n) =>
      n.text.startsWith("Started: Skim ceiling"),
    );
    expect(started_?.audience).toBe("job");
    expect(notes.some((n) => n.text.startsWith("Done: Skim ceiling"))).toBe(
      true,
    );
    const { body } = await myVisits(kit);
    expect(body.upcoming.map((v) => v.bookingId)).not.toContain(f.mine.id);
    expect(body.past.map((v) => v.bookingId)).toContain(f.mine.id);
  });
});
