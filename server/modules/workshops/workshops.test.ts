// Workshop settings (issue 14): the one settings schema at the boundary, the preview of what a
// change does to open jobs (from the engine) and the change itself re-planning them.
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
} from "../../../tests/factories/builders";
import { bankHolidayDays, isWorkingDay } from "../../../shared/programme";
import type {
  ProgrammeResponse,
  SettingsPreview,
  WorkshopResponse,
} from "../../../shared/schemas";
import { Booking } from "../bookings/bookings.entity";
import { Job } from "../jobs/jobs.entity";
import { localToday } from "../jobs/jobs.presenter";
import { workingDayAhead } from "../bookings/reminders";
import type { Workshop } from "./workshops.entity";

let t: TestApp;
let owner: Session;
let fitter: Session;
let workshop: Workshop;
const today = localToday("Europe/London");
const dayOf = (n: number) => new Date(n * 86400_000).toISOString().slice(0, 10);
const weekday = (d: string) => new Date(`${d}T12:00:00Z`).getUTCDay();

beforeAll(async () => {
  t = await startTestApp();
  const m = t.db.ds.manager;
  workshop = await buildWorkshop(m, { name: "Settings Test Joinery" });
  const o = await buildUser(m, { email: "owner-settings@example.test" });
  const f = await buildUser(m, { email: "fitter-settings@example.test" });
  await buildMember(m, workshop, o, "owner");
  await buildMember(m, workshop, f, "fitter");
  owner = await signIn(t, o.email);
  fitter = await signIn(t, f.email);
}, 120_000);
afterAll(async () => t?.close());

const patch = (who: Session, body: object, w = workshop) =>
  who.agent
    .patch(`/api/workshops/${w.id}`)
    .set("X-CSRF-Token", who.csrf)
    .send(body);
const preview = (who: Session, body: object, w = workshop) =>
  who.agent
    .post(`/api/workshops/${w.id}/settings/preview`)
    .set("X-CSRF-Token", who.csrf)
    .send(body);
const programme = async (
  who: Session,
  jobId: string,
): Promise<ProgrammeResponse> =>
  (await who.agent.get(`/api/jobs/${jobId}/programme`).expect(200)).body;

describe("settings at the boundary", () => {
  it("gives today's behaviour by default and reads back every setting", async () => {
    const res = await owner.agent
      .get(`/api/workshops/${workshop.id}`)
      .expect(200);
    const w = res.body as WorkshopResponse;
    expect(w.siteWeekdays).toEqual([1, 2, 3, 4, 5]);
    expect(w.arrivalWindows).toEqual([
      "morning",
      "afternoon",
      "all-day",
      "range",
    ]);
    expect(w.reminderDays).toBe(1);
  });

  it("refuses each bad field with its own words, and saves nothing", async () => {
    const res = await patch(owner, {
      timeZone: "Mars/Olympus_Mons",
      dayStart: "13:00",
      workingWeekdays: [],
      siteWeekdays: [8],
      arrivalWindows: [],
      reminderDays: 9,
      holidayRegion: "GB-XXX",
    }).expect(400);
    const f = res.body.error.fields as Record<string, string[]>;
    expect(f.timeZone).toEqual([
      "Choose a time zone from the list, like Europe/London",
    ]);
    // The engine's half-day slots split at 12:00 (shared/programme/prepare.ts).
    expect(f.dayStart).toEqual(["The working day must start before 12:00"]);
    expect(f.workingWeekdays).toEqual(["Choose at least one weekday"]);
    expect(Object.keys(f)).toContain("siteWeekdays.0");
    expect(f.arrivalWindows).toEqual(["Offer at least one arrival time"]);
    expect(f.reminderDays).toEqual(["At most 5 working days before"]);
    expect(Object.keys(f)).toContain("holidayRegion");
    const after = await owner.agent.get(`/api/workshops/${workshop.id}`);
    expect(after.body.timeZone).toBe("Europe/London");
    expect(after.body.reminderDays).toBe(1);
  });

  it("checks a change against the stored settings: a day end alone before the stored start", async () => {
    await patch(owner, { dayStart: "09:00" }).expect(200);
    const res = await patch(owner, { dayEnd: "08:30" }).expect(400);
    expect(res.body.error.fields.dayEnd).toEqual([
      "The working day must end after 12:00",
    ]);
    await patch(owner, { dayStart: "08:00" }).expect(200);
  });

  it("refuses an arrival time twice, an unknown one, an unknown field", async () => {
    const res = await patch(owner, {
      arrivalWindows: ["morning", "morning"],
    }).expect(400);
    expect(res.body.error.fields.arrivalWindows).toEqual([
      "Each arrival time once",
    ]);
    const unknown = await patch(owner, { arrivalWindows: ["noon"] }).expect(
      400,
    );
    expect(Object.keys(unknown.body.error.fields)).toContain(
      "arrivalWindows.0",
    );
    await patch(owner, { colour: "green" }).expect(400);
  });

  it("refuses a fitter: settings are the owner's (403, not a 5xx)", async () => {
    const p = await patch(fitter, { town: "Elsewhere" }).expect(403);
    expect(p.body.error.code).toBe("forbidden");
    await preview(fitter, { workingWeekdays: [1, 2, 3, 4] }).expect(403);
  });

  it("a new job takes the workshop's usual site days and time zone when left out", async () => {
    const m = t.db.ds.manager;
    const w = await buildWorkshop(m, { name: "Weekend Fitters" });
    const u = await buildUser(m);
    await buildMember(m, w, u, "owner");
    const s = await signIn(t, u.email);
    const customer = await buildCustomer(m, w);
    await patch(s, { siteWeekdays: [2, 3, 4, 5, 6] }, w).expect(200);
    const res = await s.agent
      .post(`/api/workshops/${w.id}/jobs`)
      .set("X-CSRF-Token", s.csrf)
      .send({
        title: "Window seat",
        customerId: customer.id,
        siteAddress: "3 Example Row, Wetherfold",
        postcode: "QX9 9AB",
        area: "Wetherfold",
        holidayRegion: "GB-ENG",
      })
      .expect(201);
    const job = await m.findOneByOrFail(Job, { id: res.body.id });
    expect(job.siteWeekdays).toEqual([2, 3, 4, 5, 6]);
    expect(job.timeZone).toBe("Europe/London");
  });
});

describe("a change that re-plans open jobs, knock-on first", () => {
  it("removing a working day: the preview shows the finish moving, PATCH applies it", async () => {
    const m = t.db.ds.manager;
    const w = await buildWorkshop(m, { name: "Four Day Joinery" });
    const u = await buildUser(m);
    await buildMember(m, w, u, "owner");
    const s = await signIn(t, u.email);
    const customer = await buildCustomer(m, w);
    const job = await buildJob(m, w, customer, { title: "Fitted wardrobe" });
    const make = await buildTask(m, job, {
      name: "Make carcasses",
      party: "workshop",
      durationDays: 8,
    });
    const fit = await buildTask(m, job, {
      name: "Fit carcasses",
      party: "workshop",
      durationDays: 2,
    });
    await buildLink(m, make, fit);
    const closed = await buildJob(m, w, customer, {
      title: "Handed over long ago",
      status: "handed-over",
    });
    await buildTask(m, closed, {
      name: "Done",
      party: "workshop",
      durationDays: 1,
    });
    const before = await programme(s, job.id);

    const res = await preview(s, { workingWeekdays: [1, 2, 3, 4] }, w).expect(
      200,
    );
    const p = res.body as SettingsPreview;
    expect(p.replans).toBe(true);
    // Only the open job: the handed-over one is not re-planned.
    expect(p.jobs.map((j) => j.title)).toEqual(["Fitted wardrobe"]);
    const j = p.jobs[0];
    expect(j.finishBefore).toBe(before.result.finish);
    expect(j.finishAfter! > j.finishBefore!).toBe(true);
    expect(j.changeDays).toBeGreaterThan(0);
    expect(j.movedTasks).toBeGreaterThan(0);
    // Nothing saved by the preview.
    expect((await programme(s, job.id)).result.finish).toBe(
      before.result.finish,
    );

    await patch(s, { workingWeekdays: [1, 2, 3, 4] }, w).expect(200);
    const after = await programme(s, job.id);
    expect(after.result.finish).toBe(j.finishAfter);
    expect(after.version).toBe(before.version + 1);
    // No Friday is worked any more on the workshop's own tasks.
    for (const task of after.result.tasks)
      expect(weekday(task.plannedStart.slice(0, 10))).not.toBe(5);
  });

  it("a nation with a bank holiday in the span (GOV.UK bank holidays, via date-holidays): the booked trade needs re-confirming", async () => {
    // The first weekday after today that is a Scottish bank holiday but not an English one
    // (e.g. the 2 January substitute, or the first Monday of August) — from the engine's list.
    const year = Number(today.slice(0, 4));
    const eng = new Set([
      ...bankHolidayDays("GB-ENG", year),
      ...bankHolidayDays("GB-ENG", year + 1),
    ]);
    const holiday = [
      ...bankHolidayDays("GB-SCT", year),
      ...bankHolidayDays("GB-SCT", year + 1),
    ]
      .map(dayOf)
      .filter((d) => d > today && !eng.has(Date.parse(d) / 86400_000))
      .filter((d) => ![0, 6].includes(weekday(d)))
      .sort()[0];
    expect(holiday).toBeDefined();

    const m = t.db.ds.manager;
    const w = await buildWorkshop(m, { name: "Border Joinery" });
    const u = await buildUser(m);
    await buildMember(m, w, u, "owner");
    const s = await signIn(t, u.email);
    const customer = await buildCustomer(m, w);
    const job = await buildJob(m, w, customer, {
      title: "Bookcase wall",
      handoverDate: holiday,
    });
    const paint = await buildTask(m, job, {
      name: "Paint",
      party: "decorator",
      durationDays: 1,
    });
    const trade = await buildTrade(m, w, {
      kind: "decorator",
      businessName: "Heron Decorating",
    });
    const booking = await buildBooking(m, paint, trade, {
      state: "confirmed",
      start: holiday,
      finish: `${holiday}T16:30`,
    });
    const other = await buildJob(m, w, customer, {
      title: "Kept in Northern Ireland",
      holidayRegion: "GB-NIR",
    });
    await buildTask(m, other, {
      name: "Survey",
      party: "workshop",
      durationDays: 1,
    });

    const res = await preview(s, { holidayRegion: "GB-SCT" }, w).expect(200);
    const p = res.body as SettingsPreview;
    const j = p.jobs.find((x) => x.title === "Bookcase wall")!;
    expect(j.nationFollows).toBe(true);
    expect(j.finishBefore!.slice(0, 10)).toBe(holiday);
    expect(j.finishAfter! > j.finishBefore!).toBe(true);
    expect(j.handoverAtRiskBefore).toBe(false);
    expect(j.handoverAtRisk).toBe(true);
    expect(j.bookings).toHaveLength(1);
    const b = j.bookings[0];
    expect(b).toMatchObject({
      bookingId: booking.id,
      taskName: "Paint",
      tradeName: "Heron Decorating",
      bookedStart: holiday,
    });
    expect(b.reason).toContain("is not a working day");
    // The proposal is a day the new site calendar works (Scotland's bank holidays).
    expect(b.proposedStart! > holiday).toBe(true);
    expect(
      isWorkingDay(
        { id: "site", holidayRegion: "GB-SCT" },
        b.proposedStart!.slice(0, 10),
      ),
    ).toBe(true);
    // A job set in another nation keeps its own and is not listed.
    expect(p.jobs.map((x) => x.title)).not.toContain(
      "Kept in Northern Ireland",
    );
    expect((await m.findOneByOrFail(Booking, { id: booking.id })).state).toBe(
      "confirmed",
    );

    await patch(s, { holidayRegion: "GB-SCT" }, w).expect(200);
    const moved = await m.findOneByOrFail(Booking, { id: booking.id });
    expect(moved.state).toBe("needs-reconfirming");
    expect(moved.start).toBe(b.proposedStart);
    expect(moved.sequence).toBe(booking.sequence + 1);
    expect((await m.findOneByOrFail(Job, { id: job.id })).holidayRegion).toBe(
      "GB-SCT",
    );
    expect((await m.findOneByOrFail(Job, { id: other.id })).holidayRegion).toBe(
      "GB-NIR",
    );
    expect((await programme(s, job.id)).result.finish).toBe(j.finishAfter);
    // The trade is told the new dates, as for any programme change.
    const mail = await t.mail.waitFor(
      (x) => x.to.includes(trade.email) && x.subject.includes("new dates"),
    );
    expect(mail.text).toContain("Please confirm again");
  });

  it("concurrent changes are serialised by the workshop's lock: none fails, each bumps every open job once", async () => {
    const m = t.db.ds.manager;
    const w = await buildWorkshop(m, { name: "Busy Owners Joinery" });
    const u = await buildUser(m);
    await buildMember(m, w, u, "owner");
    const s = await signIn(t, u.email);
    const customer = await buildCustomer(m, w);
    const jobs = [];
    for (let i = 0; i < 3; i++) {
      const job = await buildJob(m, w, customer, { title: `Run ${i}` });
      await buildTask(m, job, {
        name: "Make",
        party: "workshop",
        durationDays: 6,
      });
      jobs.push(job);
    }
    const days = [
      [1, 2, 3, 4],
      [1, 2, 3, 4, 5],
      [2, 3, 4, 5],
      [1, 2, 3, 5],
      [1, 3, 4, 5],
      [1, 2, 4, 5],
    ];
    const t0 = Date.now();
    const answers = await Promise.all(
      days.map((d) => patch(s, { workingWeekdays: d }, w)),
    );
    const took = Date.now() - t0;
    const statuses = answers.map((a) => a.status);
    // A lock wait past LOCK_WAIT_SECONDS would be 409 "busy" (server/db/locks.ts), never a 5xx.
    expect(statuses.every((c) => c === 200 || c === 409)).toBe(true);
    const ok = statuses.filter((c) => c === 200).length;
    expect(ok).toBeGreaterThan(0);
    for (const job of jobs)
      expect((await m.findOneByOrFail(Job, { id: job.id })).version).toBe(
        1 + ok,
      );
    console.info(
      `${days.length} concurrent settings changes: ${statuses.join(" ")} in ${took} ms`,
    );
  });

  it("name, town, arrival times and reminders re-plan nothing", async () => {
    const res = await preview(owner, {
      town: "Wetherfold",
      reminderDays: 2,
    }).expect(200);
    expect(res.body).toEqual({ replans: false, jobs: [], unchangedJobs: 0 });
  });
});

describe("the arrival times the workshop offers", () => {
  it("the booking options carry them, and a booking with another is refused (422)", async () => {
    const m = t.db.ds.manager;
    const w = await buildWorkshop(m, { name: "All Day Only Joinery" });
    const u = await buildUser(m);
    await buildMember(m, w, u, "owner");
    const s = await signIn(t, u.email);
    const customer = await buildCustomer(m, w);
    const job = await buildJob(m, w, customer, { title: "Media wall" });
    const task = await buildTask(m, job, {
      name: "Skim the wall",
      party: "plasterer",
      durationDays: 1,
    });
    const trade = await buildTrade(m, w, { kind: "plasterer" });
    await patch(s, { arrivalWindows: ["all-day", "range"] }, w).expect(200);
    const options = await s.agent
      .get(`/api/jobs/${job.id}/tasks/${task.id}/booking-options`)
      .expect(200);
    expect(options.body.arrivalWindows).toEqual(["all-day", "range"]);
    const start = options.body.trades[0].firstFree.start as string;
    const book = (arrivalWindow: string) =>
      s.agent
        .post(`/api/jobs/${job.id}/bookings`)
        .set("X-CSRF-Token", s.csrf)
        .send({
          taskId: task.id,
          tradeId: trade.id,
          start,
          arrivalWindow,
          send: false,
        });
    const refused = await book("morning").expect(422);
    expect(refused.body.error.fields.arrivalWindow).toEqual([
      "Choose an arrival time the workshop offers",
    ]);
    expect(await m.countBy(Booking, { taskId: task.id })).toBe(0);
    await book("all-day").expect(201);
  });
});

describe("reminder timing", () => {
  it("counts working days ahead across a weekend and a bank holiday (GOV.UK: Mon 28 Dec 2026 is the Boxing Day substitute)", () => {
    const cal = [
      {
        id: "site",
        workingWeekdays: [1, 2, 3, 4, 5],
        holidayRegion: "GB-ENG" as const,
      },
    ];
    expect(workingDayAhead(cal, "2026-12-23", 1)).toBe("2026-12-24");
    expect(workingDayAhead(cal, "2026-12-23", 2)).toBe("2026-12-29");
    expect(workingDayAhead(cal, "2026-12-03", 2)).toBe("2026-12-07"); // Thu → Mon
  });

  it("sends the reminder the workshop's number of working days before, and none at 0", async () => {
    const m = t.db.ds.manager;
    const w = await buildWorkshop(m, { name: "Early Reminders" });
    const u = await buildUser(m);
    await buildMember(m, w, u, "owner");
    const s = await signIn(t, u.email);
    const customer = await buildCustomer(m, w);
    const job = await buildJob(m, w, customer, { title: "Alcove shelves" });
    const trade = await buildTrade(m, w, { kind: "electrician" });
    const cal = [
      {
        id: "site",
        workingWeekdays: [1, 2, 3, 4, 5],
        holidayRegion: "GB-ENG" as const,
      },
    ];
    // A visit five working days on; "now" is 17:00 UTC on a given local day.
    const visit = workingDayAhead(cal, today, 5)!;
    const task = await buildTask(m, job, {
      name: "Second fix sockets",
      party: "electrician",
      durationDays: 1,
      notEarlierThan: visit,
    });
    await buildBooking(m, task, trade, {
      state: "confirmed",
      start: visit,
      finish: `${visit}T16:30`,
    });
    const at = (day: string) => new Date(`${day}T17:00:00Z`);
    const daysBefore = (n: number) => {
      // The local day from which `visit` is the nth working day ahead.
      for (let k = 0; k <= 5; k++) {
        const d = k === 0 ? today : workingDayAhead(cal, today, k)!;
        if (workingDayAhead(cal, d, n) === visit) return d;
      }
      throw new Error("no such day");
    };
    const mailsTo = () =>
      t.mail.messages().filter((x) => x.to.includes(trade.email)).length;

    await patch(s, { reminderDays: 0 }, w).expect(200);
    for (const n of [1, 2, 3]) await t.sitecue.sendReminders(at(daysBefore(n)));
    expect(mailsTo()).toBe(0);

    await patch(s, { reminderDays: 2 }, w).expect(200);
    expect(await t.sitecue.sendReminders(at(daysBefore(3)))).toBe(0);
    expect(await t.sitecue.sendReminders(at(daysBefore(1)))).toBe(0);
    expect(await t.sitecue.sendReminders(at(daysBefore(2)))).toBe(1);
    const mail = await t.mail.waitFor((x) => x.to.includes(trade.email));
    // Not "Tomorrow": it goes two working days before.
    expect(mail.subject).toMatch(
      /^On \w{3} \d{1,2} \w{3}( \d{4})?: Second fix sockets/,
    );
  });
});
