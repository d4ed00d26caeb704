// GET /api/calendar through the API (issue 15): the demo's bookings on the workshop's, a job's and
// the plasterer's own calendar, bank holidays and days off as marks, who may ask for which, and
// the range rule. One demo database; the days-off step changes the plasterer's days off.
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
import { demoSecondWorkshop } from "../../../tests/factories/demo-second-workshop";
import {
  buildBooking,
  buildJob,
  buildTask,
} from "../../../tests/factories/builders";
import {
  CALENDAR_RANGE_WORDS,
  type CalendarEntry,
  type CalendarResponse,
  type ProgrammeResponse,
} from "../../../shared/schemas";
import { Booking } from "../bookings/bookings.entity";
import { Customer } from "../customers/customers.entity";
import { Workshop } from "../workshops/workshops.entity";
import { Job } from "../jobs/jobs.entity";
import { localToday } from "../jobs/jobs.presenter";
import { Task } from "../programme/programme.entity";
import { Trade } from "../trades/trades.entity";

let t: TestApp;
let owner: Session;
let plasterer: Session;
let alcoves: Job;
let wardrobe: Job;
let bookcase: Job;
const today = localToday("Europe/London");
const day = (n: number) => weekdaysFrom(today, n);
const from = day(-20);
const to = day(30);

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  owner = await signIn(t, demoAccounts.owner.email);
  plasterer = await signIn(t, demoAccounts.trade.email);
  alcoves = await t.db.ds.manager.findOneByOrFail(Job, {
    title: demoJobTitles.alcoves,
  });
  wardrobe = await t.db.ds.manager.findOneByOrFail(Job, {
    title: demoJobTitles.wardrobe,
  });
  bookcase = await t.db.ds.manager.findOneByOrFail(Job, {
    title: demoJobTitles.bookcase,
  });
}, 120_000);
afterAll(async () => t?.close());

const calendar = async (s: Session, query: string, status = 200) =>
  (await s.agent.get(`/api/calendar?${query}`).expect(status))
    .body as CalendarResponse;
const entry = (c: CalendarResponse, taskName: string, jobId?: string) => {
  const found = c.entries.filter(
    (e) => e.taskName === taskName && (!jobId || e.jobId === jobId),
  );
  expect(found, `one entry "${taskName}"`).toHaveLength(1);
  return found[0] as CalendarEntry;
};

describe("the workshop's calendar", () => {
  it("has the demo's bookings with their states, trades and booked dates", async () => {
    const c = await calendar(
      owner,
      `scope=workshop&id=${alcoves.workshopId}&from=${from}&to=${to}`,
    );
    expect(c.scope).toBe("workshop");
    // Booked tasks sit on their bookings' days (demo-scenario.ts books these).
    expect(entry(c, "Template coving")).toMatchObject({
      jobId: alcoves.id,
      jobTitle: demoJobTitles.alcoves,
      party: "plasterer",
      state: "sent",
      who: "Ashby Plaster & Coving",
      start: day(1),
      last: day(1),
      movable: true,
    });
    expect(entry(c, "Fit coving & make good")).toMatchObject({
      state: "confirmed",
      start: day(4),
      last: day(4),
    });
    expect(entry(c, "Fill, caulk & paint")).toMatchObject({
      state: "confirmed",
      who: "Kestrel Decorating",
      start: day(6),
      last: day(7),
    });
    // A draft holds no dates for the engine, but the workshop sees whom it is drafted for.
    expect(entry(c, "Lay bedroom floor")).toMatchObject({
      jobId: wardrobe.id,
      state: "draft",
      who: "Tarn Floors",
    });
    // A done task is not movable; a workshop task carries no trade.
    expect(entry(c, "Electrician first fix (cabinet lights)")).toMatchObject({
      state: "confirmed",
      movable: false,
      start: day(-3),
    });
    expect(entry(c, "Hang doors")).toMatchObject({
      state: "workshop",
      who: null,
      tradeId: null,
    });
    // The three live jobs (the bookcase is at survey, its survey task planned), nothing else.
    expect(c.jobs.map((j) => j.title).sort()).toEqual(
      Object.values(demoJobTitles).sort(),
    );
    expect(entry(c, "Survey & measure", bookcase.id)).toMatchObject({
      state: "workshop",
      movable: true,
    });
    expect(c.trades.map((x) => x.name)).toContain("Ashby Plaster & Coving");
    // Only entries with a day in the range.
    for (const e of c.entries) {
      expect(e.last >= from && e.start <= to, e.taskName).toBe(true);
    }
  });

  it("leaves out handed-over and cancelled jobs, which the job's own calendar still shows", async () => {
    const m = t.db.ds.manager;
    const workshop = await m.findOneByOrFail(Workshop, {
      id: alcoves.workshopId,
    });
    const customer = await m.findOneByOrFail(Customer, {
      id: alcoves.customerId,
    });
    const done: Job[] = [];
    for (const status of ["handed-over", "cancelled"] as const) {
      const job = await buildJob(m, workshop, customer, {
        title: `Finished: ${status}`,
        status,
      });
      await buildTask(m, job, {
        name: `Snagging (${status})`,
        party: "workshop",
        durationDays: 1,
        notEarlierThan: day(2),
      });
      done.push(job);
    }
    const c = await calendar(
      owner,
      `scope=workshop&id=${alcoves.workshopId}&from=${from}&to=${to}`,
    );
    const ids = new Set([
      ...c.jobs.map((j) => j.id),
      ...c.entries.map((e) => e.jobId),
    ]);
    for (const job of done) expect(ids.has(job.id), job.title).toBe(false);
    const own = await calendar(
      owner,
      `scope=job&id=${done[0].id}&from=${from}&to=${to}`,
    );
    expect(own.entries.map((e) => e.taskName)).toEqual([
      "Snagging (handed-over)",
    ]);
  });

  it("puts every task on the dates GET /programme plans it on", async () => {
    const p = (
      await owner.agent.get(`/api/jobs/${alcoves.id}/programme`).expect(200)
    ).body as ProgrammeResponse;
    const c = await calendar(
      owner,
      `scope=job&id=${alcoves.id}&from=${day(-30)}&to=${day(60)}`,
    );
    expect(c.entries).toHaveLength(p.tasks.length);
    for (const r of p.result.tasks) {
      const e = c.entries.find((x) => x.taskId === r.id)!;
      expect(e.start, e.taskName).toBe(r.plannedStart.slice(0, 10));
    }
    expect(c.jobs).toEqual([
      expect.objectContaining({ id: alcoves.id, taskCount: p.tasks.length }),
    ]);
  });

  it("marks the bank holidays of a range holding Christmas", async () => {
    // GOV.UK bank holidays, England and Wales (gov.uk/bank-holidays): Fri 25 Dec 2026, Mon 28 Dec
    // 2026 (Boxing Day substitute; Sat 26 Dec is not listed), Fri 1 Jan 2027.
    const c = await calendar(
      owner,
      `scope=workshop&id=${alcoves.workshopId}&from=2026-12-01&to=2027-01-10`,
    );
    expect(
      c.marks.filter((m) => m.kind === "holiday").map((m) => m.date),
    ).toEqual(["2026-12-25", "2026-12-28", "2027-01-01"]);
    expect(c.marks.find((m) => m.date === "2026-12-25")?.label).toBe(
      "Bank holiday",
    );
  });

  it("marks a booked trade's day off, and the trade sees it as theirs", async () => {
    const off = day(12);
    await plasterer.agent
      .put("/api/me/days-off")
      .set("X-CSRF-Token", plasterer.csrf)
      .send({ daysOff: [off] })
      .expect(200);
    const c = await calendar(
      owner,
      `scope=workshop&id=${alcoves.workshopId}&from=${from}&to=${to}`,
    );
    expect(c.marks).toContainEqual({
      date: off,
      kind: "day-off",
      label: "Day off: Ashby Plaster & Coving",
    });
    const mine = await calendar(plasterer, `scope=me&from=${from}&to=${to}`);
    expect(mine.marks).toContainEqual({
      date: off,
      kind: "day-off",
      label: "Your day off",
    });
    // Outside the range asked for: not there.
    const before = await calendar(
      plasterer,
      `scope=me&from=${from}&to=${day(11)}`,
    );
    expect(before.marks.map((m) => m.date)).not.toContain(off);
  });

  it("refuses another workshop's owner without saying the calendar exists", async () => {
    const ines = await signIn(t, demoSecondWorkshop.owner.email);
    const w = await ines.agent
      .get(
        `/api/calendar?scope=workshop&id=${alcoves.workshopId}&from=${from}&to=${to}`,
      )
      .expect(404);
    expect(w.body.error.code).toBe("not-found");
    await ines.agent
      .get(`/api/calendar?scope=job&id=${alcoves.id}&from=${from}&to=${to}`)
      .expect(404);
    // The plasterer sees the job (booked on it) but not everyone's bookings on it.
    await plasterer.agent
      .get(`/api/calendar?scope=job&id=${alcoves.id}&from=${from}&to=${to}`)
      .expect(403);
    // The owner has no trade calendar of their own.
    await owner.agent
      .get(`/api/calendar?scope=me&from=${from}&to=${to}`)
      .expect(403);
  });
});

describe("the trade's own calendar", () => {
  it("has only their own offered bookings, from both workshops, and no draft", async () => {
    const m = t.db.ds.manager;
    // A draft for the plasterer on the wardrobe: the workshop's alone until sent.
    const record = await m.findOneByOrFail(Trade, {
      workshopId: alcoves.workshopId,
      businessName: "Ashby Plaster & Coving",
    });
    const floor = await m.findOneByOrFail(Task, {
      jobId: wardrobe.id,
      name: "Fit plinths, doors & scribes",
    });
    const draft = await buildBooking(m, floor, record, {
      state: "draft",
      start: `${day(8)}T08:00`,
      finish: `${day(8)}T16:30`,
    });
    expect((await m.findOneByOrFail(Booking, { id: draft.id })).state).toBe(
      "draft",
    );

    const c = await calendar(plasterer, `scope=me&from=${from}&to=${to}`);
    expect(c.entries.map((e) => e.taskName).sort()).toEqual(
      [
        "Fit coving & make good",
        "Make good around the island",
        "Skim larder walls",
        "Template coving",
      ].sort(),
    );
    expect(c.entries.map((e) => e.id)).not.toContain(
      `${wardrobe.id}:${draft.id}`,
    );
    expect(entry(c, "Template coving")).toMatchObject({
      state: "sent",
      who: "Hollin & Vane Joinery",
      jobTitle: `${demoJobTitles.alcoves}, ${alcoves.area}`,
      start: day(1),
      movable: false,
    });
    expect(entry(c, "Skim larder walls")).toMatchObject({
      state: "confirmed",
      who: demoSecondWorkshop.name,
      start: day(demoSecondWorkshop.plastererDays.skim),
    });
    // Soonest visit first: Hollin & Vane's on weekday 1, Saltmarsh & Pike's on weekday 9.
    expect([...new Set(c.jobs.map((j) => j.workshopName))]).toEqual([
      "Hollin & Vane Joinery",
      demoSecondWorkshop.name,
    ]);
    expect(c.trades).toEqual([]);
  });
});

describe("the range", () => {
  const ask = async (query: string) =>
    (await owner.agent.get(`/api/calendar?${query}`).expect(400)).body.error;
  const ws = () => `scope=workshop&id=${alcoves.workshopId}`;

  it("refuses a range longer than 400 days, saying how long it was", async () => {
    const e = await ask(`${ws()}&from=2027-01-01&to=2028-02-05`);
    expect(e.code).toBe("validation");
    expect(e.fields.to).toEqual([CALENDAR_RANGE_WORDS.tooLong(401)]);
    expect(e.fields.to[0]).toBe(
      "Ask for at most 400 days at a time (this range is 401 days)",
    );
    // 400 days exactly is fine.
    await owner.agent
      .get(`/api/calendar?${ws()}&from=2027-01-01&to=2028-02-04`)
      .expect(200);
  });

  it("refuses a range that ends before it starts, a missing id and a bad date", async () => {
    expect(
      (await ask(`${ws()}&from=2027-01-10&to=2027-01-09`)).fields.to,
    ).toEqual([CALENDAR_RANGE_WORDS.order]);
    expect(
      (await ask(`scope=job&from=2027-01-01&to=2027-01-09`)).fields.id,
    ).toEqual([CALENDAR_RANGE_WORDS.idNeeded]);
    expect(
      (await ask(`${ws()}&from=2027-02-30&to=2027-03-09`)).fields.from,
    ).toEqual(["Not a real calendar date"]);
  });
});
