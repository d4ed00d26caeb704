// Per-person calendar feeds (issue 6), each parsed with ical.js (the reference parser named in
// references.md §2) and checked against the demo scenario: the right events, nothing more.
import type { TimelineResponse } from "../../../shared/schemas";
import ICAL from "ical.js";
import { In, Not } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  anonymous,
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
import { AuditEntry } from "../audit/audit.entity";
import { Booking } from "../bookings/bookings.entity";
import { Customer } from "../customers/customers.entity";
import { Job } from "../jobs/jobs.entity";
import { Task } from "../programme/programme.entity";
import { Trade, TradeMember } from "../trades/trades.entity";
import { User } from "../users/users.entity";
import { Workshop } from "../workshops/workshops.entity";
import { taskEventUid } from "./feed-content";

type Component = InstanceType<typeof ICAL.Component>;

let t: TestApp;
let workshopA: Workshop;
let ashby: Trade;

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  const m = t.db.ds.manager;
  workshopA = await m.findOneByOrFail(Workshop, {
    name: DEMO_WORKSHOP_NAME,
  });
  ashby = await m.findOneByOrFail(Trade, {
    businessName: "Ashby Plaster & Coving",
  });
}, 120_000);
afterAll(async () => t?.close());

/** Makes the person's feed through the API and returns its path below the app. */
async function feedPath(s: Session): Promise<string> {
  const res = await s.agent
    .post("/api/me/feed")
    .set("X-CSRF-Token", s.csrf)
    .expect(201);
  expect(res.body.url).toMatch(
    /^http:\/\/localhost\/api\/feeds\/[\w-]{43}\.ics$/,
  );
  return new URL(res.body.url).pathname;
}

async function fetchFeed(path: string) {
  const res = await (await anonymous(t)).agent.get(path).expect(200);
  expect(res.headers["content-type"]).toBe("text/calendar; charset=utf-8");
  const text: string = res.text;
  const cal = new ICAL.Component(ICAL.parse(text));
  return { res, text, cal, events: cal.getAllSubcomponents("vevent") };
}

const uids = (events: Component[]) =>
  events.map((e) => String(e.getFirstPropertyValue("uid"))).sort();
const byUid = (events: Component[], uid: string) =>
  events.find((e) => e.getFirstPropertyValue("uid") === uid)!;
const prop = (e: Component, name: string) =>
  String(e.getFirstPropertyValue(name) ?? "");

/** RFC 5546 §3.2.1 (PUBLISH: ORGANIZER, no ATTENDEE) and RFC 7986 §5.7 / §5.1 on a whole feed. */
function expectPublishFeed(cal: Component, events: Component[]) {
  expect(cal.getFirstPropertyValue("method")).toBe("PUBLISH");
  const refresh = cal.getFirstProperty("refresh-interval");
  expect(refresh, "REFRESH-INTERVAL (RFC 7986 §5.7)").not.toBeNull();
  expect(refresh!.type).toBe("duration"); // written REFRESH-INTERVAL;VALUE=DURATION
  expect(String(refresh!.getFirstValue())).toBe("PT1H");
  expect(prop(cal, "name")).toMatch(/^Sitecue: /);
  for (const e of events) {
    expect(e.getFirstProperty("organizer"), "ORGANIZER").not.toBeNull();
    expect(e.getAllProperties("attendee"), "no ATTENDEE").toHaveLength(0);
  }
}

describe("a trade's feed", () => {
  it("holds exactly their bookings, the full address only once confirmed (RFC 5546 §3.2.1 PUBLISH)", async () => {
    const dev = await signIn(t, demoAccounts.trade.email);
    const { cal, events, text } = await fetchFeed(await feedPath(dev));
    expectPublishFeed(cal, events);
    // Their bookings in both demo workshops (the second knows them by its own record, issue 14).
    const mine = await t.db.ds.manager.findBy(Booking, {
      tradeId: In(
        (
          await t.db.ds.manager.findBy(TradeMember, {
            userId: (
              await t.db.ds.manager.findOneByOrFail(User, {
                email: demoAccounts.trade.email,
              })
            ).id,
          })
        ).map((l) => l.tradeId),
      ),
      state: In(["sent", "confirmed", "date-proposed", "needs-reconfirming"]),
    });
    expect(mine).toHaveLength(4);
    expect(uids(events)).toEqual(mine.map((b) => b.icalUid).sort());
    const here = mine.filter((b) => b.tradeId === ashby.id);
    const confirmed = here.find((b) => b.state === "confirmed")!;
    const sent = here.find((b) => b.state === "sent")!;
    expect(prop(byUid(events, confirmed.icalUid), "location")).toBe(
      "14 Larkspur Terrace, Wetherfold, QX4 2LT",
    );
    // One address rule (issue 16): they are confirmed for another task on this job, so they know
    // the address already; the visit not yet confirmed carries it too (before, the job page showed
    // it while this event said "Larkspur, Wetherfold").
    expect(prop(byUid(events, sent.icalUid), "location")).toBe(
      "14 Larkspur Terrace, Wetherfold, QX4 2LT",
    );
    // Unconfirmed and unshared, with no confirmed booking on the job: the area only.
    await t.db.ds.manager.update(
      Booking,
      { id: confirmed.id },
      { state: "needs-reconfirming" },
    );
    try {
      const again = await fetchFeed(await feedPath(dev));
      for (const b of [confirmed, sent])
        expect(prop(byUid(again.events, b.icalUid), "location")).toBe(
          "Larkspur, Wetherfold",
        );
      // Not confirmed: STATUS says so (RFC 5545 §3.8.1.11), from the lifecycle table.
      expect(
        byUid(again.events, confirmed.icalUid).getFirstPropertyValue("status"),
      ).toBe("TENTATIVE");
    } finally {
      await t.db.ds.manager.update(
        Booking,
        { id: confirmed.id },
        { state: "confirmed" },
      );
    }
    expect(
      byUid(events, confirmed.icalUid).getFirstPropertyValue("status"),
    ).toBe("CONFIRMED");
    expect(byUid(events, sent.icalUid).getFirstPropertyValue("status")).toBe(
      "TENTATIVE",
    );
    expect(
      byUid(events, confirmed.icalUid).getFirstPropertyValue("sequence"),
    ).toBe(confirmed.sequence);
    // No other trade's details, no internal notes.
    for (const other of [
      "Kestrel",
      "Brightwire",
      "Tarn",
      "01632 960 271",
      "out of plumb",
      "Sprayed doors",
    ])
      expect(text).not.toContain(other);
  });

  it("covers every workshop a trade works for: one person, trade records in two workshops", async () => {
    const m = t.db.ds.manager;
    const user = await buildUser(m, {
      email: "kit@twoshops.example.test",
      name: "Kit Farrow",
      password: DEMO_PASSWORD,
    });
    const workshopB = await buildWorkshop(m, { name: "Weir Street Cabinets" });
    const inA = await buildTrade(m, workshopA, {
      kind: "plasterer",
      businessName: "Farrow Plastering",
    });
    const inB = await buildTrade(m, workshopB, {
      kind: "plasterer",
      businessName: "Farrow Plastering",
    });
    await linkTradeUser(m, inA, user);
    await linkTradeUser(m, inB, user);
    const rosa = await m.findOneByOrFail(Customer, {
      email: demoAccounts.customer.email,
    });
    const jobA = await buildJob(m, workshopA, rosa, { title: "Feed job A" });
    const custB = await buildCustomer(m, workshopB);
    const jobB = await buildJob(m, workshopB, custB, {
      title: "Feed job B",
      area: "Weir, Wetherfold",
    });
    const taskA = await buildTask(m, jobA, {
      name: "Skim ceiling",
      party: "plasterer",
    });
    const taskB = await buildTask(m, jobB, {
      name: "Run coving",
      party: "plasterer",
    });
    const bA = await buildBooking(m, taskA, inA, {
      state: "sent",
      start: "2027-04-05T08:00",
      finish: "2027-04-05T16:30",
    });
    const bB = await buildBooking(m, taskB, inB, {
      state: "confirmed",
      start: "2027-04-06T08:00",
      finish: "2027-04-06T16:30",
    });
    // Not in the feed: a draft and a cancelled booking of theirs, and someone else's booking.
    await buildBooking(m, taskB, inB, {
      state: "draft",
      start: "2027-04-07T08:00",
      finish: "2027-04-07T16:30",
    });
    await buildBooking(m, taskA, inA, {
      state: "cancelled",
      start: "2027-04-08T08:00",
      finish: "2027-04-08T16:30",
    });

    const kit = await signIn(t, "kit@twoshops.example.test");
    const { cal, events } = await fetchFeed(await feedPath(kit));
    expectPublishFeed(cal, events);
    expect(uids(events)).toEqual([bA.icalUid, bB.icalUid].sort());
    expect(prop(byUid(events, bB.icalUid), "location")).toBe(
      "1 Example Row, Wetherfold, QX1 1AA",
    );
    expect(prop(byUid(events, bA.icalUid), "location")).toBe("Wetherfold");
    // All-day bookings: DTEND is exclusive (RFC 5545 §3.6.1).
    expect(
      String(byUid(events, bB.icalUid).getFirstPropertyValue("dtend")),
    ).toBe("2027-04-07");
  });
});

describe("a customer's feed", () => {
  it("holds the visits on their own job only: trade kind and name, arrival, what to prepare, no internal notes", async () => {
    const rosaS = await signIn(t, demoAccounts.customer.email);
    const { cal, events, text } = await fetchFeed(await feedPath(rosaS));
    expectPublishFeed(cal, events);
    const m = t.db.ds.manager;
    const rosa = await m.findOneByOrFail(Customer, {
      email: demoAccounts.customer.email,
    });
    const jobs = await m.findBy(Job, { customerId: rosa.id });
    const visits = await m.findBy(Booking, {
      jobId: In(jobs.map((j) => j.id)),
      state: In(["sent", "confirmed", "date-proposed", "needs-reconfirming"]),
    });
    expect(visits.length).toBeGreaterThanOrEqual(5);
    // Feed = timeline (issue 16): every visit her timeline lists, the workshop's own visits too
    // (a booking by its UID, a workshop task by its stable task UID).
    const fromTimeline: string[] = [];
    for (const job of jobs) {
      const tl = (
        await rosaS.agent.get(`/api/jobs/${job.id}/timeline`).expect(200)
      ).body as TimelineResponse;
      for (const v of tl.visits)
        fromTimeline.push(
          v.party === "workshop"
            ? taskEventUid(v.id)
            : visits.find((b) => b.id === v.id)!.icalUid,
        );
    }
    expect(fromTimeline.length).toBeGreaterThan(visits.length);
    expect(uids(events)).toEqual(fromTimeline.sort());
    // Nothing of the other customers' jobs.
    const wardrobe = await m.findOneByOrFail(Job, {
      title: demoJobTitles.wardrobe,
    });
    const theirs = await m.findBy(Booking, { jobId: wardrobe.id });
    expect(theirs.length).toBeGreaterThan(0);
    for (const b of theirs) expect(uids(events)).not.toContain(b.icalUid);
    expect(text).not.toContain("Millrace");

    const alcoves = await m.findOneByOrFail(Job, {
      title: demoJobTitles.alcoves,
    });
    const coving = await m.findOneByOrFail(Task, {
      jobId: alcoves.id,
      name: "Fit coving & make good",
    });
    const covingVisit = visits.find((b) => b.taskId === coving.id)!;
    const e = byUid(events, covingVisit.icalUid);
    expect(prop(e, "summary")).toBe("Plasterer: Ashby Plaster & Coving");
    expect(prop(e, "description")).toContain("arriving 08:00–09:00");
    expect(prop(e, "description")).toContain(
      "Expect dust: keep the room closed and pets out.",
    );
    // No internal notes, no trade phone or e-mail.
    expect(text).not.toContain("out of plumb");
    expect(text).not.toContain("Sprayed doors");
    expect(text).not.toContain("01632 960");
    expect(text).not.toContain("@ashbyplaster");
  });
});

describe("a workshop member's feed", () => {
  it("holds every live booking and every workshop task of the workshop, on the programme's planned dates", async () => {
    const martha = await signIn(t, demoAccounts.owner.email);
    const { cal, events } = await fetchFeed(await feedPath(martha));
    expectPublishFeed(cal, events);
    const m = t.db.ds.manager;
    const bookings = await m.findBy(Booking, {
      workshopId: workshopA.id,
      state: Not(In(["cancelled", "declined"])),
    });
    const jobs = await m.findBy(Job, {
      workshopId: workshopA.id,
      status: Not("cancelled"),
    });
    const tasks = await m.findBy(Task, {
      jobId: In(jobs.map((j) => j.id)),
      party: "workshop",
    });
    expect(tasks.length).toBeGreaterThanOrEqual(9);
    expect(uids(events)).toEqual(
      [
        ...bookings.map((b) => b.icalUid),
        ...tasks.map((x) => taskEventUid(x.id)),
      ].sort(),
    );
    // Another workshop's booking is not in it.
    const other = await m.findOneByOrFail(Booking, {
      jobId: (await m.findOneByOrFail(Job, { title: "Feed job B" })).id,
      state: "confirmed",
    });
    expect(uids(events)).not.toContain(other.icalUid);

    // A workshop task on the dates the programme engine plans (compare with the programme route).
    const alcoves = await m.findOneByOrFail(Job, {
      title: demoJobTitles.alcoves,
    });
    const programme = (
      await martha.agent.get(`/api/jobs/${alcoves.id}/programme`).expect(200)
    ).body;
    const doors = programme.tasks.find(
      (x: { name: string }) => x.name === "Hang doors",
    );
    const planned = programme.result.tasks.find(
      (x: { id: string }) => x.id === doors.id,
    );
    const ev = byUid(events, taskEventUid(doors.id));
    const start = ev.getFirstPropertyValue("dtstart") as InstanceType<
      typeof ICAL.Time
    >;
    expect(start.toString().slice(0, 16)).toBe(planned.plannedStart);
    expect(taskEventUid(doors.id)).toMatch(
      /^[0-9a-f]{8}-[0-9a-f]{4}-5[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/,
    );
  });
});

describe("a programme the engine refuses", () => {
  it("leaves that job's tasks out and keeps the rest of the feed", async () => {
    const m = t.db.ds.manager;
    const rosa = await m.findOneByOrFail(Customer, {
      email: demoAccounts.customer.email,
    });
    const job = await buildJob(m, workshopA, rosa, { title: "Looped job" });
    const a = await buildTask(m, job, { name: "Loop A", party: "workshop" });
    const b = await buildTask(m, job, { name: "Loop B", party: "workshop" });
    await buildLink(m, a, b);
    await buildLink(m, b, a);
    const martha = await signIn(t, demoAccounts.owner.email);
    const { events } = await fetchFeed(await feedPath(martha));
    expect(uids(events)).not.toContain(taskEventUid(a.id));
    const alcoves = await m.findOneByOrFail(Job, {
      title: demoJobTitles.alcoves,
    });
    const doors = await m.findOneByOrFail(Task, {
      jobId: alcoves.id,
      name: "Hang doors",
    });
    expect(uids(events)).toContain(taskEventUid(doors.id));
    await m.delete(Job, { id: job.id });
  });
});

describe("polling, regenerating and revoking", () => {
  it("answers If-None-Match and If-Modified-Since with 304, and a change with a new ETag", async () => {
    const dev = await signIn(t, demoAccounts.trade.email);
    const path = await feedPath(dev);
    const first = await (await anonymous(t)).agent.get(path).expect(200);
    const etag = first.headers["etag"];
    expect(etag).toMatch(/^"[\w-]+"$/);
    expect(first.headers["cache-control"]).toBe("private, max-age=300");
    const lastModified = first.headers["last-modified"];
    expect(Date.parse(lastModified)).not.toBeNaN();
    // The same body twice: the ETag does not change between polls.
    const again = await (await anonymous(t)).agent.get(path).expect(200);
    expect(again.headers["etag"]).toBe(etag);
    const cached = await (
      await anonymous(t)
    ).agent
      .get(path)
      .set("If-None-Match", etag);
    expect(cached.status).toBe(304);
    expect(cached.text ?? "").toBe("");
    const since = await (
      await anonymous(t)
    ).agent
      .get(path)
      .set("If-Modified-Since", lastModified);
    expect(since.status).toBe(304);
    const stale = await (
      await anonymous(t)
    ).agent
      .get(path)
      .set("If-None-Match", '"something-else"');
    expect(stale.status).toBe(200);

    // A booking moves: the feed changes, so the old ETag no longer matches.
    const b = await t.db.ds.manager.findOneByOrFail(Booking, {
      tradeId: ashby.id,
      state: "sent",
    });
    await new Promise((r) => setTimeout(r, 1100));
    await t.db.ds.manager.update(
      Booking,
      { id: b.id },
      { arrivalWindow: "all-day", sequence: b.sequence + 1 },
    );
    const moved = await (
      await anonymous(t)
    ).agent
      .get(path)
      .set("If-None-Match", etag);
    expect(moved.status).toBe(200);
    expect(moved.headers["etag"]).not.toBe(etag);
    expect(Date.parse(moved.headers["last-modified"])).toBeGreaterThan(
      Date.parse(lastModified),
    );
    const after = await (
      await anonymous(t)
    ).agent
      .get(path)
      .set("If-Modified-Since", lastModified);
    expect(after.status).toBe(200);
  });

  it("a regenerated URL replaces the old one; a revoked one is refused (404)", async () => {
    const rosa = await signIn(t, demoAccounts.customer.email);
    const old = await feedPath(rosa);
    await (await anonymous(t)).agent.get(old).expect(200);
    // Without ".ics" too.
    await (await anonymous(t)).agent.get(old.replace(/\.ics$/, "")).expect(200);
    const status = await rosa.agent.get("/api/me/feed").expect(200);
    expect(status.body.exists).toBe(true);
    expect(status.body).not.toHaveProperty("url");

    const fresh = await feedPath(rosa);
    expect(fresh).not.toBe(old);
    const gone = await (await anonymous(t)).agent.get(old).expect(404);
    expect(gone.body.error.code).toBe("not-found");
    await (await anonymous(t)).agent.get(fresh).expect(200);

    await rosa.agent
      .delete("/api/me/feed")
      .set("X-CSRF-Token", rosa.csrf)
      .expect(204);
    const revoked = await (await anonymous(t)).agent.get(fresh).expect(404);
    expect(revoked.body.error.code).toBe("not-found");
    expect((await rosa.agent.get("/api/me/feed").expect(200)).body).toEqual({
      exists: false,
      createdAt: null,
    });
    const unknown = await (
      await anonymous(t)
    ).agent
      .get(`/api/feeds/${"x".repeat(43)}.ics`)
      .expect(404);
    expect(unknown.body.error.code).toBe("not-found");
  });

  it("serves a valid calendar with nothing in it to someone with nothing to see", async () => {
    const m = t.db.ds.manager;
    await buildUser(m, {
      email: "nobody@feeds.example.test",
      password: DEMO_PASSWORD,
    });
    const s = await signIn(t, "nobody@feeds.example.test");
    const { cal, events } = await fetchFeed(await feedPath(s));
    expect(events).toHaveLength(0);
    expect(cal.getFirstPropertyValue("method")).toBe("PUBLISH");
    expect(cal.getAllSubcomponents().length).toBeGreaterThan(0); // RFC 5545 §3.6: one component at least
  });
});

describe("days off, entered once for every workshop", () => {
  it("PUT writes the list to every trade record of the person, audits each workshop, and the engine skips the day", async () => {
    const m = t.db.ds.manager;
    const kit = await signIn(t, "kit@twoshops.example.test");
    const records = await m.findBy(Trade, {
      businessName: "Farrow Plastering",
    });
    expect(records).toHaveLength(2);
    const inA = records.find((r) => r.workshopId === workshopA.id)!;

    // A fresh plasterer task in workshop A that could start Mon 1 Mar 2027.
    const rosa = await m.findOneByOrFail(Customer, {
      email: demoAccounts.customer.email,
    });
    const job = await buildJob(m, workshopA, rosa, { title: "Days-off job" });
    const task = await buildTask(m, job, {
      name: "Template coving",
      party: "plasterer",
      durationDays: 1,
      notEarlierThan: "2027-03-01",
    });
    const owner = await signIn(t, demoAccounts.owner.email);
    const firstFree = async () => {
      const res = await owner.agent
        .get(`/api/jobs/${job.id}/tasks/${task.id}/booking-options`)
        .expect(200);
      return res.body.trades
        .find((x: { tradeId: string }) => x.tradeId === inA.id)
        .firstFree.start.slice(0, 10);
    };
    expect(await firstFree()).toBe("2027-03-01");

    const res = await kit.agent
      .put("/api/me/days-off")
      .set("X-CSRF-Token", kit.csrf)
      .send({ daysOff: ["2027-03-01", "2026-12-24", "2027-03-01"] })
      .expect(200);
    expect(res.body).toEqual({ daysOff: ["2026-12-24", "2027-03-01"] });
    for (const r of await m.findBy(Trade, { id: In(records.map((x) => x.id)) }))
      expect(r.daysOff).toEqual(["2026-12-24", "2027-03-01"]);
    const kitUser = await m.findOneByOrFail(User, {
      email: "kit@twoshops.example.test",
    });
    const audits = await m.findBy(AuditEntry, {
      action: "trade.daysOff.updated",
      actorUserId: kitUser.id,
    });
    expect(audits.map((a) => a.workshopId).sort()).toEqual(
      records.map((r) => r.workshopId).sort(),
    );
    expect((await kit.agent.get("/api/me/days-off").expect(200)).body).toEqual({
      daysOff: ["2026-12-24", "2027-03-01"],
    });

    // The engine now treats Mon 1 Mar as a day off for that trade.
    expect(await firstFree()).toBe("2027-03-02");
    // Another trade's record is untouched.
    expect((await m.findOneByOrFail(Trade, { id: ashby.id })).daysOff).toEqual(
      [],
    );
  });

  it("refuses dates that are not real, too many, and people who speak for no trade", async () => {
    const kit = await signIn(t, "kit@twoshops.example.test");
    const bad = await kit.agent
      .put("/api/me/days-off")
      .set("X-CSRF-Token", kit.csrf)
      .send({ daysOff: ["2027-02-30"] });
    expect(bad.status).toBe(400);
    const many = Array.from({ length: 367 }, (_, i) =>
      new Date(Date.UTC(2027, 0, 1 + i)).toISOString().slice(0, 10),
    );
    expect(
      (
        await kit.agent
          .put("/api/me/days-off")
          .set("X-CSRF-Token", kit.csrf)
          .send({ daysOff: many })
      ).status,
    ).toBe(400);
    const owner = await signIn(t, demoAccounts.owner.email);
    const res = await owner.agent
      .put("/api/me/days-off")
      .set("X-CSRF-Token", owner.csrf)
      .send({ daysOff: ["2027-03-01"] });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe("forbidden");
  });
});
