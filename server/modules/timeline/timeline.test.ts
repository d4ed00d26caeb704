// The customer's timeline and away dates through the API (issue 8, customer part; the brief's
// scenarios 3 and 4 as the householder meets them, and "the customer can mark dates they are
// away; those days close the site for booking"). One demo database; the steps build on each other.
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
  weekdaysFrom,
} from "../../../tests/factories/demo-scenario";
import type {
  ProgrammeResponse,
  TimelineResponse,
  TimelineVisit,
} from "../../../shared/schemas";
import { Job } from "../jobs/jobs.entity";
import { localToday } from "../jobs/jobs.presenter";
import { Trade } from "../trades/trades.entity";
import { Booking } from "../bookings/bookings.entity";
import { plusDays } from "./timeline.presenter";

let t: TestApp;
let owner: Session;
let rosa: Session;
let alcoves: Job;
let wardrobe: Job;
// The demo is placed relative to the job's today (Europe/London), in weekdays.
const today = localToday("Europe/London");
const day = (n: number) => weekdaysFrom(today, n);

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  owner = await signIn(t, demoAccounts.owner.email);
  rosa = await signIn(t, demoAccounts.customer.email);
  alcoves = await t.db.ds.manager.findOneByOrFail(Job, {
    title: demoJobTitles.alcoves,
  });
  wardrobe = await t.db.ds.manager.findOneByOrFail(Job, {
    title: demoJobTitles.wardrobe,
  });
}, 120_000);
afterAll(async () => t?.close());

const timeline = async (s: Session, jobId = alcoves.id) =>
  (await s.agent.get(`/api/jobs/${jobId}/timeline`).expect(200))
    .body as TimelineResponse;
const visit = (tl: TimelineResponse, taskName: string) => {
  const v = tl.visits.find((x) => x.taskName === taskName);
  expect(v, `visit "${taskName}"`).toBeDefined();
  return v as TimelineVisit;
};
const markSeen = async (s: Session, version: number) =>
  s.agent
    .post(`/api/jobs/${alcoves.id}/timeline/seen`)
    .set("X-CSRF-Token", s.csrf)
    .send({ version });
const programme = async (): Promise<ProgrammeResponse> =>
  (await owner.agent.get(`/api/jobs/${alcoves.id}/programme`).expect(200)).body;
const taskId = (p: ProgrammeResponse, name: string) =>
  p.tasks.find((x) => x.name === name)!.id;
const putAway = (s: Session, ranges: { from: string; to: string }[]) =>
  s.agent
    .put(`/api/jobs/${alcoves.id}/away-dates`)
    .set("X-CSRF-Token", s.csrf)
    .send({ ranges });

describe("the customer's timeline", () => {
  it("shows each visit of their own job: who, days, arrival window, what to prepare", async () => {
    const tl = await timeline(rosa);
    expect(tl.jobTitle).toBe(demoJobTitles.alcoves);
    expect(tl.handoverDate).toBe(day(8));
    expect(tl.lastSeenAt).toBeNull();

    const template = visit(tl, "Template coving");
    expect(template).toMatchObject({
      party: "plasterer",
      businessName: "Ashby Plaster & Coving",
      start: `${day(1)}T08:00`,
      arrival: { window: "morning" },
      past: false,
      change: null,
    });
    const coving = visit(tl, "Fit coving & make good");
    expect(coving.arrival).toEqual({
      window: "range",
      from: "08:00",
      to: "09:00",
    });
    expect(coving.prepare).toBe(
      "Expect dust: keep the room closed and pets out.",
    );
    expect(visit(tl, "Electrician second fix")).toMatchObject({
      party: "electrician",
      businessName: "Brightwire Electrical",
      arrival: { window: "afternoon" },
    });
    expect(visit(tl, "Fill, caulk & paint")).toMatchObject({
      businessName: "Kestrel Decorating",
      start: `${day(6)}T08:00`,
      finish: `${day(7)}T16:30`,
      arrival: { window: "all-day" },
      prepare: "Keep the room free of dust for painting; windows closed.",
    });
    // The workshop's own fitting visits, under the workshop's name, at the engine's dates.
    const carcasses = visit(tl, "Fix carcasses & scribes");
    expect(carcasses).toMatchObject({
      party: "workshop",
      businessName: "Hollin & Vane Joinery",
      prepare: "Clear both alcoves and the floor in front of them.",
    });
    expect(visit(tl, "Hang doors").start.slice(0, 10)).toBe(day(2));
    // Over already: the first fix three days ago.
    expect(visit(tl, "Electrician first fix (cabinet lights)").past).toBe(true);
    // Handover is a date, not a visit.
    expect(tl.visits.some((v) => v.taskName === "Walk-round with the customer")).toBe(false);
    // In date order.
    const starts = tl.visits.map((v) => v.start);
    expect(starts).toEqual([...starts].sort());
  });

  it("never carries float, booking states, internal notes, trades' contacts or other jobs", async () => {
    const res = await rosa.agent
      .get(`/api/jobs/${alcoves.id}/timeline`)
      .expect(200);
    const text = JSON.stringify(res.body);
    for (const never of [
      "Float",
      "float",
      "critical",
      "confirmed",
      "needs-reconfirming",
      '"state"',
      "internalNote",
      "out of plumb", // the carcasses' internal note
      "Sprayed doors due", // the doors' internal note
      "dev@ashbyplaster.example.test",
      "01632 960 114",
      "sam@brightwire.example.test",
      "01632 960 388",
      "Tarn Floors", // Tom's wardrobe job
      "Lay bedroom floor",
      "Key safe", // access notes are for confirmed trades
    ])
      expect(text, never).not.toContain(never);
    const keys = new Set(
      (res.body as TimelineResponse).visits.flatMap((v) => Object.keys(v)),
    );
    expect([...keys].sort()).toEqual(
      [
        "arrival",
        "awayDays",
        "businessName",
        "change",
        "finish",
        "id",
        "party",
        "past",
        "prepare",
        // Whether the trade has confirmed the days: a yes or no, not the booking's state.
        "settled",
        "start",
        "taskName",
      ].sort(),
    );
  });

  it("is the job's customer's and the workshop's: not a trade's, not another customer's", async () => {
    const staff = await timeline(owner);
    const own = await timeline(rosa);
    expect(staff.visits.map((v) => v.id)).toEqual(own.visits.map((v) => v.id));
    const trade = await signIn(t, demoAccounts.trade.email);
    await trade.agent.get(`/api/jobs/${alcoves.id}/timeline`).expect(403);
    // Rosa's own job only: Tom's wardrobe is not visible to her at all.
    await rosa.agent.get(`/api/jobs/${wardrobe.id}/timeline`).expect(404);
  });

  it("highlights a visit moved by a slip since the customer last looked, with its old date", async () => {
    const before = await timeline(rosa);
    const secondFix = visit(before, "Electrician second fix");
    expect(secondFix.start).toBe(`${day(3)}T12:00`);
    // Sent and not answered yet: not settled (the demo's second fix); the confirmed paint is.
    expect(secondFix.settled).toBe(false);
    expect(visit(before, "Fill, caulk & paint").settled).toBe(true);
    const seen = await markSeen(rosa, before.version);
    expect(seen.status).toBe(200);
    expect((await timeline(rosa)).lastSeenAt).toBe(seen.body.seenAt);
    expect(
      (await timeline(rosa)).visits.filter((v) => v.change !== null),
    ).toEqual([]);

    // Scenario 4: the sprayed doors come three days late; the maker moves "Hang doors" through
    // the programme's apply (the engine re-books the second fix that waits for it).
    const p = await programme();
    const applied = await owner.agent
      .post(`/api/jobs/${alcoves.id}/programme/apply`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: p.version,
        changes: [{ taskId: taskId(p, "Hang doors"), notEarlierThan: day(5) }],
      })
      .expect(200);
    expect(applied.body.impact.reconfirm.length).toBeGreaterThan(0);

    const after = await timeline(rosa);
    const moved = visit(after, "Electrician second fix");
    expect(moved.start.slice(0, 10) > day(3)).toBe(true);
    expect(moved.change).toEqual({
      kind: "moved",
      was: {
        start: `${day(3)}T12:00`,
        finish: `${day(3)}T16:30`,
        arrival: { window: "afternoon", from: null, to: null },
      },
    });
    const doors = visit(after, "Hang doors");
    expect(doors.start.slice(0, 10)).toBe(day(5));
    expect(doors.change?.kind).toBe("moved");
    // Visits the slip did not touch are not highlighted.
    expect(visit(after, "Template coving").change).toBeNull();
    expect(visit(after, "Fill, caulk & paint").change).toBeNull();
    // Issue 16, settled too early: the moved visit is to be confirmed until the trade re-confirms;
    // a confirmed one the slip did not move stays settled, and so do the workshop's own visits.
    expect(moved.settled).toBe(false);
    // Issue 16: the arrival follows the new slot (it was "afternoon" at 12:00; re-booked at the
    // electrician's first free start, which may be a morning).
    expect(moved.arrival.window).toBe(
      moved.start.slice(11, 16) >= "12:00" ? "afternoon" : "morning",
    );
    expect(visit(after, "Fill, caulk & paint").settled).toBe(true);
    expect(doors.settled).toBe(true);
    // Nothing of the re-confirming shows: the customer sees a day, not a state.
    expect(JSON.stringify(after)).not.toContain("reconfirm");

    // The workshop's own marker is its own: the owner never marked, so sees no highlight.
    expect((await timeline(owner)).visits.every((v) => !v.change)).toBe(true);

    // A stale version is refused (the change would otherwise be marked seen unseen).
    expect((await markSeen(rosa, before.version)).status).toBe(409);
    await markSeen(rosa, after.version).then((r) => expect(r.status).toBe(200));
    expect(
      (await timeline(rosa)).visits.filter((v) => v.change !== null),
    ).toEqual([]);
  });

  it("withdraws a cancelled or declined visit and never shows a draft", async () => {
    const m = t.db.ds.manager;
    const secondFix = await m.findOneByOrFail(Booking, {
      id: visit(await timeline(rosa), "Electrician second fix").id,
    });
    await owner.agent
      .post(`/api/bookings/${secondFix.id}/cancel`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ reason: "Electrician off sick" })
      .expect(200);
    const template = visit(await timeline(rosa), "Template coving");
    await owner.agent
      .post(`/api/bookings/${template.id}/answer`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ answer: "decline", channel: "phone", note: "Van off the road" })
      .expect(200);
    const after = await timeline(rosa);
    expect(after.visits.map((v) => v.taskName)).not.toContain(
      "Electrician second fix",
    );
    expect(after.visits.map((v) => v.taskName)).not.toContain(
      "Template coving",
    );

    // A draft for the second fix: the trade has not been asked, so the customer sees nothing.
    const electrician = await m.findOneByOrFail(Trade, {
      businessName: "Brightwire Electrical",
      workshopId: alcoves.workshopId,
    });
    const p = await programme();
    const draft = await owner.agent
      .post(`/api/jobs/${alcoves.id}/bookings`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        taskId: taskId(p, "Electrician second fix"),
        tradeId: electrician.id,
        start: day(7),
        arrivalWindow: "morning",
        send: false,
        overrideReason: "Test draft",
      })
      .expect(201);
    expect(draft.body.state).toBe("draft");
    expect(
      (await timeline(rosa)).visits.some((v) => v.id === draft.body.id),
    ).toBe(false);
    await owner.agent
      .post(`/api/bookings/${draft.body.id}/cancel`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ reason: "Test draft" })
      .expect(200);
  });
});

describe("dates the customer will be away", () => {
  it("refuses past dates, dates over a year ahead, back-to-front ranges, non-dates and too many ranges", async () => {
    const past = await putAway(rosa, [
      { from: plusDays(today, -1), to: today },
    ]);
    expect(past.status).toBe(400);
    expect(past.body.error.code).toBe("validation");
    expect(Object.keys(past.body.error.fields)).toEqual(["ranges.0.from"]);

    const far = await putAway(rosa, [
      { from: plusDays(today, 30), to: plusDays(today, 367) },
    ]);
    expect(far.status).toBe(400);
    expect(Object.keys(far.body.error.fields)).toEqual(["ranges.0.to"]);
    // A year ahead (366 days, a leap year's worth) is still allowed.
    expect(
      (
        await putAway(rosa, [
          { from: plusDays(today, 366), to: plusDays(today, 366) },
        ])
      ).status,
    ).toBe(200);

    const backwards = await putAway(rosa, [
      { from: plusDays(today, 10), to: plusDays(today, 9) },
    ]);
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.fields["ranges.0.to"]).toEqual([
      "The last day comes on or after the first",
    ]);

    // ISO 8601 calendar dates only: 30 February does not exist.
    const notADate = await putAway(rosa, [
      { from: "2027-02-30", to: "2027-03-01" },
    ]);
    expect(notADate.status).toBe(400);

    const many = Array.from({ length: 13 }, (_, i) => ({
      from: plusDays(today, 20 + i * 3),
      to: plusDays(today, 20 + i * 3),
    }));
    expect((await putAway(rosa, many)).status).toBe(400);
    expect((await putAway(rosa, many.slice(0, 12))).status).toBe(200);

    // Nothing refused was stored: the last good list stands.
    const tl = await timeline(rosa);
    expect(tl.away).toHaveLength(12);
    expect((await putAway(rosa, [])).status).toBe(200);
    expect((await timeline(rosa)).away).toEqual([]);
  });

  it("closes the site, flags a visit already booked then, and tells the workshop", async () => {
    const coving = visit(await timeline(rosa), "Fit coving & make good");
    const covingDay = coving.start.slice(0, 10);
    const res = await putAway(rosa, [
      { from: covingDay, to: covingDay },
      { from: plusDays(today, 60), to: plusDays(today, 64) },
    ]);
    expect(res.status).toBe(200);
    const tl = res.body as TimelineResponse;
    expect(tl.away).toEqual([
      { from: covingDay, to: covingDay },
      { from: plusDays(today, 60), to: plusDays(today, 64) },
    ]);
    expect(visit(tl, "Fit coving & make good").awayDays).toEqual([covingDay]);
    expect(visit(tl, "Fill, caulk & paint").awayDays).toEqual([]);

    // The workshop's thread note (workshop only: not in the customer's own thread).
    const ownerThread = await owner.agent
      .get(`/api/jobs/${alcoves.id}/thread`)
      .expect(200);
    // Messages come oldest first: the last note is this change's.
    const note = ownerThread.body.messages
      .filter((m: { text: string }) =>
        m.text.startsWith("Rosa Pennick will be away"),
      )
      .at(-1);
    expect(note).toBeDefined();
    expect(note.audience).toBe("workshop");
    expect(note.text).toContain(
      "Booked on those days: Ashby Plaster & Coving for Fit coving & make good",
    );
    const rosaThread = await rosa.agent
      .get(`/api/jobs/${alcoves.id}/thread`)
      .expect(200);
    expect(
      rosaThread.body.messages.some((m: { text: string }) =>
        m.text.includes("will be away"),
      ),
    ).toBe(false);

    // The maker's attention list can read the clash.
    const clashes = await owner.agent
      .get(`/api/workshops/${alcoves.workshopId}/away-clashes`)
      .expect(200);
    expect(clashes.body.clashes).toEqual([
      expect.objectContaining({
        jobId: alcoves.id,
        bookingId: coving.id,
        taskName: "Fit coving & make good",
        tradeName: "Ashby Plaster & Coving",
        awayDays: [covingDay],
      }),
    ]);

    // The engine's site calendar has the day closed: the booked start is on a non-working day.
    const p = await programme();
    const covingResult = (
      p.result as {
        tasks: { id: string; problems: { code: string; message: string }[] }[];
      }
    ).tasks.find((x) => x.id === taskId(p, "Fit coving & make good"))!;
    expect(covingResult.problems.map((x) => x.code)).toContain(
      "non-working-day",
    );
    expect(p.engine.calendars.find((c) => c.id === "site")!.daysOff).toContain(
      covingDay,
    );
  });

  it("the engine refuses a new booking on an away day and offers the next free start after it", async () => {
    const away = day(9);
    expect((await putAway(rosa, [{ from: away, to: away }])).status).toBe(200);
    const p = await programme();
    const electrician = await t.db.ds.manager.findOneByOrFail(Trade, {
      businessName: "Brightwire Electrical",
      workshopId: alcoves.workshopId,
    });
    const refused = await owner.agent
      .post(`/api/jobs/${alcoves.id}/bookings`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        taskId: taskId(p, "Electrician second fix"),
        tradeId: electrician.id,
        start: away,
        arrivalWindow: "morning",
        send: false,
      });
    expect(refused.status).toBe(409);
    expect(refused.body.error.fields.start.join(" ")).toContain(
      "not a working day",
    );
    const next = refused.body.error.fields.nextFreeStart[0] as string;
    expect(next.slice(0, 10) > away).toBe(true);
    // The first free start the workshop is offered never lands on the away day either.
    const options = await owner.agent
      .get(
        `/api/jobs/${alcoves.id}/tasks/${taskId(p, "Electrician second fix")}/booking-options`,
      )
      .expect(200);
    for (const o of options.body.trades as {
      firstFree: { start: string } | null;
    }[])
      if (o.firstFree) expect(o.firstFree.start.slice(0, 10)).not.toBe(away);
  });

  it("the workshop may enter them on the customer's behalf; a trade may not", async () => {
    const fitter = await signIn(t, demoAccounts.fitter.email);
    const from = plusDays(today, 90);
    expect((await putAway(fitter, [{ from, to: from }])).status).toBe(200);
    expect((await timeline(rosa)).away).toEqual([{ from, to: from }]);
    const trade = await signIn(t, demoAccounts.trade.email);
    expect((await putAway(trade, [])).status).toBe(403);
    // Removing every range reopens the site and clears the flags.
    expect((await putAway(rosa, [])).status).toBe(200);
    const tl = await timeline(rosa);
    expect(tl.away).toEqual([]);
    expect(tl.visits.every((v) => v.awayDays.length === 0)).toBe(true);
    const clashes = await owner.agent
      .get(`/api/workshops/${alcoves.workshopId}/away-clashes`)
      .expect(200);
    expect(clashes.body.clashes).toEqual([]);
  });
});
