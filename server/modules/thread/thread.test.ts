// The job thread through the API (issue 7): audiences per role, posting rules, plain text,
// attachments and their permission, unread markers, the `after` cursor, system notes from the
// booking and programme paths, and batched e-mail notices.
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  anonymous,
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../../tests/setup/test-app";
import { sampleElf, samplePng } from "../../../tests/setup/uploads";
import {
  buildBooking,
  buildJob,
  buildLink,
  buildTask,
  buildUser,
  linkTradeUser,
} from "../../../tests/factories/builders";
import {
  demoAccounts,
  demoJobTitles,
  DEMO_WORKSHOP_NAME,
} from "../../../tests/factories/demo-scenario";
import {
  demoThreadCounts,
  demoThreadTexts,
} from "../../../tests/factories/demo-thread";
import type {
  ThreadAudience,
  ThreadMessage,
  ThreadResponse,
} from "../../../shared/schemas";
import { OutboxMessage } from "../../infra/outbox/outbox.entity";
import { Customer } from "../customers/customers.entity";
import { Job } from "../jobs/jobs.entity";
import { StoredFile } from "../files/files.entity";
import { Trade } from "../trades/trades.entity";
import { Workshop } from "../workshops/workshops.entity";
import { ThreadNotice } from "./thread.entity";

let t: TestApp;
let workshop: Workshop;
let rosa: Customer;
let ashby: Trade;
let kestrel: Trade;
const s: Record<
  "owner" | "fitter" | "dev" | "kit" | "rosa" | "ola" | "tom",
  Session
> = {} as never;
const email = {
  owner: demoAccounts.owner.email,
  fitter: demoAccounts.fitter.email,
  dev: demoAccounts.trade.email,
  kit: "kit@kestrel.example.test",
  rosa: demoAccounts.customer.email,
  ola: "ola@tarnfloors.example.test",
  tom: "tom.fennimore@example.test",
};

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  const m = t.db.ds.manager;
  workshop = await m.findOneByOrFail(Workshop, {
    name: DEMO_WORKSHOP_NAME,
  });
  rosa = await m.findOneByOrFail(Customer, {
    email: demoAccounts.customer.email,
  });
  const byName = (businessName: string) =>
    m.findOneByOrFail(Trade, { businessName, workshopId: workshop.id });
  ashby = await byName("Ashby Plaster & Coving");
  kestrel = await byName("Kestrel Decorating");
  // A person for the decorator, one for a trade never booked on the test jobs, and the other customer.
  await linkTradeUser(
    m,
    kestrel,
    await buildUser(m, { email: email.kit, name: "Kit Kestrel" }),
  );
  await linkTradeUser(
    m,
    await byName("Tarn Floors"),
    await buildUser(m, { email: email.ola, name: "Ola Tarn" }),
  );
  const tomUser = await buildUser(m, {
    email: email.tom,
    name: "Tom Fennimore",
  });
  await m.update(Customer, { email: email.tom }, { userId: tomUser.id });
  for (const k of Object.keys(email) as (keyof typeof email)[])
    s[k] = await signIn(t, email[k]);
}, 120_000);
afterAll(async () => t?.close());

const unique = () => randomBytes(3).toString("hex");

/** Rosa's job with Ashby's booking sent (Dev is on it) and Kestrel's confirmed (Kit is on it). */
async function freshJob(title = `Thread job ${unique()}`) {
  const m = t.db.ds.manager;
  const job = await buildJob(m, workshop, rosa, { title });
  const fix = await buildTask(m, job, {
    name: "Fix carcasses & scribes",
    party: "workshop",
    durationDays: 2,
  });
  const template = await buildTask(m, job, {
    name: "Template coving",
    party: "plasterer",
    durationDays: 0.5,
  });
  await buildLink(m, fix, template);
  const paint = await buildTask(m, job, {
    name: "Paint alcoves",
    party: "decorator",
    durationDays: 1,
  });
  await buildLink(m, template, paint, { lag: 2 });
  const booking = await buildBooking(m, template, ashby, {
    state: "sent",
    start: "2027-02-01T08:00",
    finish: "2027-02-01T12:00",
  });
  await buildBooking(m, paint, kestrel, {
    state: "confirmed",
    start: "2027-02-08T08:00",
    finish: "2027-02-08T16:30",
  });
  return {
    jobId: job.id,
    title,
    fixId: fix.id,
    job,
    template,
    bookingId: booking.id,
  };
}

const post = (
  who: Session,
  jobId: string,
  audience: ThreadAudience | string,
  text: string,
) =>
  who.agent
    .post(`/api/jobs/${jobId}/thread/messages`)
    .set("X-CSRF-Token", who.csrf)
    .send({ audience, text });

const thread = async (
  who: Session,
  jobId: string,
  query = "",
): Promise<ThreadResponse> =>
  (await who.agent.get(`/api/jobs/${jobId}/thread${query}`).expect(200)).body;

const texts = (r: ThreadResponse) => r.messages.map((x) => x.text);

describe("the demo's thread", () => {
  // Runs first: nothing else has posted on the demo jobs yet.
  const T = demoThreadTexts;
  const demoJob = (title: string) =>
    t.db.ds.manager.findOneByOrFail(Job, { title });
  const has = (r: ThreadResponse, text: string) =>
    texts(r).some((x) => x.includes(text));
  const tradesTexts = [T.covingProfile, T.covingAnswer, T.scribeGap];
  const workshopTexts = [T.fitterLeftWall, T.ownerFinisher, T.fitterShims];
  const jobTexts = [T.weekAhead, T.customerReply, T.carcassesUp];

  it("the alcove job has a few days of messages in every audience, read up to where each person left off", async () => {
    const { id } = await demoJob(demoJobTitles.alcoves);
    const owner = await thread(s.owner, id);
    const byAudience = (r: ThreadResponse) =>
      Object.fromEntries(
        (["job", "trades", "workshop"] as const).map((a) => [
          a,
          r.messages.filter((x) => x.audience === a).length,
        ]),
      );
    expect(byAudience(owner)).toEqual(demoThreadCounts.alcoves);
    expect(owner.messages.every((x) => x.kind === "message")).toBe(true);
    // Oldest first, a few working days back to yesterday, never in the future.
    const times = owner.messages.map((x) => Date.parse(x.createdAt));
    expect(times).toEqual([...times].sort((a, b) => a - b));
    expect(times[0]).toBeLessThan(Date.now() - 2 * 86_400_000);
    expect(times[0]).toBeGreaterThan(Date.now() - 10 * 86_400_000);
    expect(times.at(-1)).toBeLessThan(Date.now());
    // The owner has not read the plasterer's and the fitter's evening messages.
    expect(owner.unreadCount).toBe(demoThreadCounts.alcovesUnread.owner);
    expect(owner.messages.filter((x) => x.unread).map((x) => x.text)).toEqual([
      expect.stringContaining(T.scribeGap),
      expect.stringContaining(T.fitterShims),
    ]);
    expect((await thread(s.fitter, id)).unreadCount).toBe(
      demoThreadCounts.alcovesUnread.fitter,
    );
    // Authors as posting labels them.
    const authorOf = (text: string) =>
      owner.messages.find((x) => x.text.includes(text))?.author;
    expect(authorOf(T.covingAnswer)).toEqual({
      name: demoAccounts.trade.name,
      label: "Ashby Plaster & Coving",
      role: "trade",
    });
    expect(authorOf(T.customerReply)).toEqual({
      name: demoAccounts.customer.name,
      label: "Customer",
      role: "customer",
    });
    expect(authorOf(T.fitterShims)).toEqual({
      name: demoAccounts.fitter.name,
      label: "Workshop",
      role: "workshop",
    });
    // No contact details in any message: no phone numbers, no e-mail addresses.
    for (const m of owner.messages) {
      expect(m.text).not.toMatch(/\b0\d{3,4} ?\d{3} ?\d{3,4}\b/);
      expect(m.text).not.toContain("@");
    }
    // In the story the notice e-mails went out long ago: the demo owes none.
    expect(await t.db.ds.manager.count(ThreadNotice)).toBe(0);
  });

  it("keeps each demo audience to its people: the plasterer never sees Workshop only, the customer only the whole job", async () => {
    const { id } = await demoJob(demoJobTitles.alcoves);
    for (const who of ["dev", "kit"] as const) {
      const r = await thread(s[who], id);
      for (const x of [...jobTexts, ...tradesTexts])
        expect(has(r, x), `${who}: ${x}`).toBe(true);
      for (const x of workshopTexts)
        expect(has(r, x), `${who}: ${x}`).toBe(false);
    }
    // Dev read up to his own message; Kit (a person of the decorator) never opened it.
    expect((await thread(s.dev, id)).unreadCount).toBe(
      demoThreadCounts.alcovesUnread.trade,
    );
    expect((await thread(s.kit, id)).unreadCount).toBe(
      demoThreadCounts.alcoves.job + demoThreadCounts.alcoves.trades,
    );
    const rosaView = await thread(s.rosa, id);
    expect(rosaView.messages.every((x) => x.audience === "job")).toBe(true);
    for (const x of jobTexts) expect(has(rosaView, x), x).toBe(true);
    for (const x of [...tradesTexts, ...workshopTexts])
      expect(has(rosaView, x), x).toBe(false);
    // She read up to her reply: the workshop's update yesterday is new to her.
    expect(rosaView.unreadCount).toBe(demoThreadCounts.alcovesUnread.customer);
    expect(
      rosaView.messages.filter((x) => x.unread).map((x) => x.text),
    ).toEqual([expect.stringContaining(T.carcassesUp)]);
    // The unread lists agree: the owner's only unread job is the alcoves.
    const ownerUnread = (
      await s.owner.agent.get("/api/thread/unread").expect(200)
    ).body;
    expect(ownerUnread).toMatchObject({
      total: demoThreadCounts.alcovesUnread.owner,
      jobs: [
        {
          jobId: id,
          jobTitle: demoJobTitles.alcoves,
          unreadCount: demoThreadCounts.alcovesUnread.owner,
        },
      ],
    });
  });

  it("the wardrobe job has the workshop's own notes, read, and nothing its customer sees", async () => {
    const { id } = await demoJob(demoJobTitles.wardrobe);
    const owner = await thread(s.owner, id);
    expect(owner.messages.map((x) => x.audience)).toEqual(
      Array(demoThreadCounts.wardrobe.workshop).fill("workshop"),
    );
    expect(has(owner, T.wardrobeSurvey)).toBe(true);
    expect(owner.unreadCount).toBe(0);
    expect((await thread(s.fitter, id)).unreadCount).toBe(0);
    const tom = await thread(s.tom, id);
    expect(tom.audiences).toEqual(["job"]);
    expect(tom.messages).toEqual([]);
    const { id: bookcase } = await demoJob(demoJobTitles.bookcase);
    expect((await thread(s.owner, bookcase)).messages).toEqual([]);
  });
});

describe("audiences", () => {
  it("offers each role exactly the audiences the roles table gives it; others get 404", async () => {
    const { jobId } = await freshJob();
    const all = ["job", "trades", "workshop"];
    for (const who of ["owner", "fitter"] as const) {
      const r = await thread(s[who], jobId);
      expect(r.visibleAudiences, who).toEqual(all);
      expect(r.audiences, who).toEqual(all);
    }
    for (const who of ["dev", "kit"] as const)
      expect((await thread(s[who], jobId)).audiences, who).toEqual([
        "job",
        "trades",
      ]);
    expect((await thread(s.rosa, jobId)).audiences).toEqual(["job"]);
    for (const who of ["ola", "tom"] as const) {
      const res = await s[who].agent.get(`/api/jobs/${jobId}/thread`);
      expect(res.status, who).toBe(404);
      expect(res.body.error.code).toBe("not-found");
    }
    const anon = await anonymous(t);
    expect((await anon.agent.get(`/api/jobs/${jobId}/thread`)).status).toBe(
      401,
    );
  });

  it("shows each person only their audiences: a trade never sees workshop-only, the customer only the whole job", async () => {
    const { jobId } = await freshJob();
    await post(s.owner, jobId, "job", "Skip hire arrives Monday").expect(201);
    await post(s.owner, jobId, "trades", "Park on the side road").expect(201);
    await post(s.fitter, jobId, "workshop", "Margin is thin here").expect(201);
    expect(texts(await thread(s.fitter, jobId))).toEqual([
      "Skip hire arrives Monday",
      "Park on the side road",
      "Margin is thin here",
    ]);
    for (const who of ["dev", "kit"] as const)
      expect(texts(await thread(s[who], jobId)), who).toEqual([
        "Skip hire arrives Monday",
        "Park on the side road",
      ]);
    expect(texts(await thread(s.rosa, jobId))).toEqual([
      "Skip hire arrives Monday",
    ]);
    // The unread list follows the same rule.
    const unread = (await s.rosa.agent.get("/api/thread/unread").expect(200))
      .body;
    expect(
      unread.jobs.find((j: { jobId: string }) => j.jobId === jobId),
    ).toMatchObject({ unreadCount: 1 });
  });

  it("names the author as the thread shows them: Workshop, the trade's business, Customer", async () => {
    const { jobId } = await freshJob();
    const a = (await post(s.owner, jobId, "job", "From the workshop")).body;
    const b = (await post(s.dev, jobId, "trades", "From the plasterer")).body;
    const c = (await post(s.rosa, jobId, "job", "From the house")).body;
    expect(a.author).toEqual({
      name: demoAccounts.owner.name,
      label: "Workshop",
      role: "workshop",
    });
    expect(b.author).toEqual({
      name: demoAccounts.trade.name,
      label: "Ashby Plaster & Coving",
      role: "trade",
    });
    expect(c.author).toEqual({
      name: demoAccounts.customer.name,
      label: "Customer",
      role: "customer",
    });
    expect(a.kind).toBe("message");
    expect(Date.parse(a.createdAt)).toBeGreaterThan(Date.now() - 60_000);
    // A trade's contact details never travel with their messages.
    const seen = JSON.stringify(await thread(s.rosa, jobId));
    expect(seen).not.toContain(ashby.email);
    expect(seen).not.toContain(ashby.phone);
  });
});

describe("posting", () => {
  it("refuses an audience the person may not post to with 403 and says which they can use", async () => {
    const { jobId } = await freshJob();
    const dev = await post(s.dev, jobId, "workshop", "Let me in");
    expect(dev.status).toBe(403);
    expect(dev.body.error.code).toBe("forbidden");
    expect(dev.body.error.message).toBe(
      'You cannot post to "Workshop only" on this job; you can post to "Whole job" or "Trades & workshop".',
    );
    const rosaRes = await post(s.rosa, jobId, "trades", "Hello trades");
    expect(rosaRes.status).toBe(403);
    expect(rosaRes.body.error.message).toContain('"Whole job"');
    expect((await post(s.ola, jobId, "job", "Hi")).status).toBe(404);
    expect((await post(s.tom, jobId, "job", "Hi")).status).toBe(404);
    // Nothing was stored by the refused posts.
    expect((await thread(s.owner, jobId)).messages).toEqual([]);
  });

  it("validates the text: not empty, at most 4000 characters, a known audience", async () => {
    const { jobId } = await freshJob();
    const empty = await post(s.owner, jobId, "job", "   ");
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.text).toEqual(["Write a message"]);
    const long = await post(s.owner, jobId, "job", "x".repeat(4001));
    expect(long.status).toBe(400);
    expect(long.body.error.fields.text).toEqual([
      "Keep a message under 4000 characters",
    ]);
    expect((await post(s.owner, jobId, "job", "x".repeat(4000))).status).toBe(
      201,
    );
    const bad = await post(s.owner, jobId, "everyone", "Hi");
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.audience).toBeDefined();
  });

  it("keeps HTML as the characters typed: stored verbatim, returned as text", async () => {
    const { jobId } = await freshJob();
    const raw = `<script>alert("x")</script> <b>bold</b> & <img src=x onerror=alert(1)> https://example.test/plan?a=1&b=2`;
    const res = await post(s.owner, jobId, "job", raw).expect(201);
    expect(res.headers["content-type"]).toMatch(/^application\/json/);
    expect(res.body.text).toBe(raw);
    const got = await thread(s.rosa, jobId);
    expect(got.messages[0].text).toBe(raw);
  });
});

describe("cursor and unread markers", () => {
  it("returns only messages after the cursor, oldest first, and pages back with before", async () => {
    const { jobId } = await freshJob();
    await post(s.owner, jobId, "job", "one").expect(201);
    const first = await thread(s.dev, jobId);
    expect(texts(first)).toEqual(["one"]);
    await post(s.owner, jobId, "workshop", "hidden from trades").expect(201);
    await post(s.owner, jobId, "trades", "two").expect(201);
    await post(s.rosa, jobId, "job", "three").expect(201);
    const next = await thread(s.dev, jobId, `?after=${first.cursor}`);
    expect(texts(next)).toEqual(["two", "three"]);
    expect(next.cursor).toBe(next.messages[1].seq);
    expect(next.messages[0].seq).toBeLessThan(next.messages[1].seq);
    const none = await thread(s.dev, jobId, `?after=${next.cursor}`);
    expect(none.messages).toEqual([]);
    expect(none.cursor).toBe(next.cursor);
    // The latest page of one, then the one before it.
    const last = await thread(s.dev, jobId, "?limit=1");
    expect(texts(last)).toEqual(["three"]);
    expect(last.hasEarlier).toBe(true);
    const before = await thread(
      s.dev,
      jobId,
      `?limit=2&before=${last.messages[0].seq}`,
    );
    expect(texts(before)).toEqual(["one", "two"]);
    expect(before.hasEarlier).toBe(false);
    const badCursor = await s.dev.agent.get(
      `/api/jobs/${jobId}/thread?after=-1`,
    );
    expect(badCursor.status).toBe(400);
  });

  it("counts unread per person, never their own, and moves the read marker forward only", async () => {
    const { jobId, title } = await freshJob();
    const m1 = (await post(s.owner, jobId, "job", "first")).body;
    await post(s.owner, jobId, "job", "second").expect(201);
    await post(s.owner, jobId, "workshop", "not for Rosa").expect(201);
    const r = await thread(s.rosa, jobId);
    expect(r.unreadCount).toBe(2);
    expect(r.lastReadSeq).toBe(0);
    expect(r.messages.map((x) => x.unread)).toEqual([true, true]);
    const own = await thread(s.owner, jobId);
    expect(own.unreadCount).toBe(0);
    expect(own.messages.every((x) => x.mine && !x.unread)).toBe(true);
    expect((await thread(s.fitter, jobId)).unreadCount).toBe(3);

    const summary = (await s.rosa.agent.get("/api/thread/unread").expect(200))
      .body;
    expect(
      summary.jobs.find((j: { jobId: string }) => j.jobId === jobId),
    ).toMatchObject({ jobTitle: title, unreadCount: 2 });

    // Read up to the first only, then everything.
    const part = await s.rosa.agent
      .post(`/api/jobs/${jobId}/thread/read`)
      .set("X-CSRF-Token", s.rosa.csrf)
      .send({ seq: m1.seq })
      .expect(200);
    expect(part.body).toEqual({ lastReadSeq: m1.seq, unreadCount: 1 });
    const all = await s.rosa.agent
      .post(`/api/jobs/${jobId}/thread/read`)
      .set("X-CSRF-Token", s.rosa.csrf)
      .send({})
      .expect(200);
    expect(all.body.unreadCount).toBe(0);
    // Never backwards; never past what she can see (the workshop-only message is later).
    const back = await s.rosa.agent
      .post(`/api/jobs/${jobId}/thread/read`)
      .set("X-CSRF-Token", s.rosa.csrf)
      .send({ seq: m1.seq })
      .expect(200);
    expect(back.body.lastReadSeq).toBe(all.body.lastReadSeq);
    expect(all.body.lastReadSeq).toBeLessThan(
      (await thread(s.owner, jobId)).cursor,
    );
    const after = await thread(s.rosa, jobId);
    expect(after.messages.map((x) => x.unread)).toEqual([false, false]);
    const gone = (await s.rosa.agent.get("/api/thread/unread").expect(200))
      .body;
    expect(
      gone.jobs.find((j: { jobId: string }) => j.jobId === jobId),
    ).toBeUndefined();

    await post(s.dev, jobId, "job", "third").expect(201);
    expect((await thread(s.rosa, jobId)).unreadCount).toBe(1);
    // The fitter's own read marker is separate from Rosa's.
    expect((await thread(s.fitter, jobId)).unreadCount).toBe(4);
  });
});

describe("system notes", () => {
  const systemNotes = (r: ThreadResponse) =>
    r.messages.filter((x) => x.kind === "system");

  it("notes a confirmation from the answer path for the trades and workshop, not the customer", async () => {
    const { jobId, bookingId } = await freshJob();
    await s.owner.agent
      .post(`/api/bookings/${bookingId}/answer`)
      .set("X-CSRF-Token", s.owner.csrf)
      .send({ answer: "confirm", channel: "phone", note: "Said yes" })
      .expect(200);
    const notes = systemNotes(await thread(s.owner, jobId));
    expect(notes).toHaveLength(1);
    expect(notes[0]).toMatchObject({
      audience: "trades",
      author: null,
      text: "Ashby Plaster & Coving confirmed Template coving: Mon 1 Feb 2027, all day.",
    });
    expect(systemNotes(await thread(s.kit, jobId))).toHaveLength(1);
    expect(systemNotes(await thread(s.rosa, jobId))).toHaveLength(0);
    // The phone note is the workshop's record, never put in the thread.
    expect(JSON.stringify(await thread(s.kit, jobId))).not.toContain(
      "Said yes",
    );
  });

  it("keeps a decline in the workshop only", async () => {
    const { jobId, bookingId } = await freshJob();
    await s.fitter.agent
      .post(`/api/bookings/${bookingId}/answer`)
      .set("X-CSRF-Token", s.fitter.csrf)
      .send({ answer: "decline", channel: "text", note: "Too busy" })
      .expect(200);
    const notes = systemNotes(await thread(s.owner, jobId));
    expect(notes.map((x) => [x.audience, x.text])).toEqual([
      [
        "workshop",
        "Ashby Plaster & Coving declined Template coving (Mon 1 Feb 2027, all day).",
      ],
    ]);
    expect(systemNotes(await thread(s.kit, jobId))).toEqual([]);
  });

  it("notes a sent booking, a proposed date and its refusal for the workshop; a reschedule and a cancellation for the trades too", async () => {
    const { jobId, bookingId, job, template, fixId } = await freshJob();
    const m = t.db.ds.manager;
    const coving = await buildTask(m, job, {
      name: "Fit coving",
      party: "plasterer",
      durationDays: 1,
    });
    await buildLink(m, template, coving, { lag: 3 });
    const as = (path: string, body: object) =>
      s.owner.agent
        .post(path)
        .set("X-CSRF-Token", s.owner.csrf)
        .send(body)
        .expect((r) =>
          expect(r.status, JSON.stringify(r.body)).toBeLessThan(300),
        );
    await as(`/api/jobs/${jobId}/bookings`, {
      taskId: coving.id,
      tradeId: ashby.id,
      start: "2027-02-15",
      arrivalWindow: "all-day",
      overrideReason: "Booked for the test",
      send: true,
    });
    await as(`/api/bookings/${bookingId}/answer`, {
      answer: "propose",
      channel: "phone",
      proposedStart: "2027-02-02",
      note: "Rang to move it",
    });
    await as(`/api/bookings/${bookingId}/proposal`, {
      accept: false,
      note: "That day is taken",
    });
    const { version } = (
      await s.owner.agent.get(`/api/jobs/${jobId}/programme`).expect(200)
    ).body;
    await as(`/api/jobs/${jobId}/programme/apply`, {
      version,
      changes: [{ taskId: fixId, notEarlierThan: "2027-02-03" }],
    });
    await as(`/api/bookings/${bookingId}/cancel`, {
      reason: "Customer postponed the coving",
    });
    const notes = (r: ThreadResponse) =>
      r.messages
        .filter((x) => x.kind === "system")
        .map((x) => `${x.audience}: ${x.text}`);
    const all = notes(await thread(s.owner, jobId));
    expect(all[0]).toBe(
      "workshop: Booking sent: Ashby Plaster & Coving for Fit coving, Mon 15 Feb 2027, all day.",
    );
    expect(all[1]).toBe(
      "workshop: Ashby Plaster & Coving proposes Tue 2 Feb 2027 for Template coving instead of Mon 1 Feb 2027.",
    );
    expect(all[2]).toBe(
      "workshop: Ashby Plaster & Coving's proposed date for Template coving was not accepted; asked again for Mon 1 Feb 2027, all day.",
    );
    expect(all[3]).toMatch(
      /^trades: Rescheduled: Template coving with Ashby Plaster & Coving moves to \w{3} \d+ Feb 2027, all day; it needs re-confirming\.$/,
    );
    expect(all.at(-1)).toBe(
      "trades: Booking cancelled: Ashby Plaster & Coving for Template coving.",
    );
    // Kit (another trade on the job) sees only the trades notes; Rosa none; no reason or phone note anywhere.
    expect(notes(await thread(s.kit, jobId))).toEqual(
      all.filter((x) => x.startsWith("trades: ")),
    );
    expect(notes(await thread(s.rosa, jobId))).toEqual([]);
    const seen = JSON.stringify(await thread(s.owner, jobId));
    expect(seen).not.toContain("Customer postponed");
    expect(seen).not.toContain("Rang to move it");
  });

  it("notes a task started and done for the whole job", async () => {
    const { jobId, fixId } = await freshJob();
    const version = (
      await s.owner.agent.get(`/api/jobs/${jobId}/programme`).expect(200)
    ).body.version;
    await s.owner.agent
      .post(`/api/jobs/${jobId}/tasks/${fixId}/progress`)
      .set("X-CSRF-Token", s.owner.csrf)
      .send({ version, actualStart: "2027-01-25", actualFinish: null })
      .expect(200);
    await s.owner.agent
      .post(`/api/jobs/${jobId}/tasks/${fixId}/progress`)
      .set("X-CSRF-Token", s.owner.csrf)
      .send({
        version: version + 1,
        actualStart: "2027-01-25",
        actualFinish: "2027-01-26",
      })
      .expect(200);
    const notes = systemNotes(await thread(s.rosa, jobId));
    expect(notes.map((x) => [x.audience, x.text])).toEqual([
      ["job", "Started: Fix carcasses & scribes (Mon 25 Jan)."],
      ["job", "Done: Fix carcasses & scribes (Tue 26 Jan)."],
    ]);
    expect(notes.every((x) => x.author === null && x.unread)).toBe(true);
  });
});

describe("attachments", () => {
  const upload = (
    who: Session,
    jobId: string,
    fields: { audience: string; text?: string },
    files: { name: string; body: Buffer }[],
  ) => {
    let req = who.agent
      .post(`/api/jobs/${jobId}/thread/messages/upload`)
      .set("X-CSRF-Token", who.csrf)
      .field("audience", fields.audience);
    if (fields.text !== undefined) req = req.field("text", fields.text);
    for (const f of files) req = req.attach("file", f.body, f.name);
    return req;
  };

  it("round-trips a site photo and lets only those who see the message download it", async () => {
    const { jobId } = await freshJob();
    const other = await freshJob();
    const png = await samplePng(640, 320);
    const res = await upload(s.dev, jobId, { audience: "trades" }, [
      { name: "wall.png", body: png },
    ]);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const msg: ThreadMessage = res.body;
    expect(msg.text).toBe("");
    expect(msg.attachments).toHaveLength(1);
    const a = msg.attachments[0];
    expect(a).toMatchObject({
      name: "wall.png",
      mimeType: "image/png",
      sizeBytes: png.length,
      width: 640,
      height: 320,
      hasThumbnail: true,
      url: `/api/jobs/${jobId}/thread/attachments/${a.id}`,
    });
    const got = await s.owner.agent
      .get(a.url)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on("data", (c: Buffer) => chunks.push(c));
        r.on("end", () => cb(null, Buffer.concat(chunks)));
      })
      .expect(200);
    expect(got.headers["content-type"]).toBe("image/png");
    expect(Buffer.compare(got.body as Buffer, png)).toBe(0);
    const thumb = await s.kit.agent.get(a.thumbnailUrl!).expect(200);
    expect(thumb.headers["content-type"]).toBe("image/webp");
    // The customer does not see a trades message, nor its file; strangers see neither; another job's path does not reach it.
    for (const who of ["rosa", "ola", "tom"] as const)
      expect((await s[who].agent.get(a.url)).status, who).toBe(404);
    expect(
      (
        await s.owner.agent.get(
          `/api/jobs/${other.jobId}/thread/attachments/${a.id}`,
        )
      ).status,
    ).toBe(404);
    // It is listed with the message in the thread.
    const listed = (await thread(s.kit, jobId)).messages[0];
    expect(listed.attachments.map((x) => x.id)).toEqual([a.id]);
  });

  it("removes the uploaded files when the audience is refused", async () => {
    const { jobId } = await freshJob();
    const before = await t.db.ds.manager.count(StoredFile);
    const res = await upload(
      s.rosa,
      jobId,
      { audience: "trades", text: "Photo" },
      [{ name: "door.png", body: await samplePng(32, 32) }],
    );
    expect(res.status).toBe(403);
    expect(res.body.error.message).toContain('"Whole job"');
    expect(await t.db.ds.manager.count(StoredFile)).toBe(before);
    const ok = await upload(s.rosa, jobId, { audience: "job", text: "Photo" }, [
      { name: "door.png", body: await samplePng(32, 32) },
      { name: "hall.png", body: await samplePng(48, 32) },
    ]);
    expect(ok.status).toBe(201);
    expect(ok.body.attachments.map((x: { name: string }) => x.name)).toEqual([
      "door.png",
      "hall.png",
    ]);
  });

  it("refuses a file that is not a drawing or photo, and more than five files, keeping nothing", async () => {
    const { jobId } = await freshJob();
    const before = await t.db.ds.manager.count(StoredFile);
    const elf = await upload(s.owner, jobId, { audience: "job" }, [
      { name: "plan.pdf", body: sampleElf() },
    ]);
    expect(elf.status).toBe(415);
    expect(elf.body.error.message).toContain("plan.pdf is not a PDF");
    const png = await samplePng(16, 16);
    const six = await upload(
      s.owner,
      jobId,
      { audience: "job" },
      Array.from({ length: 6 }, (_, i) => ({ name: `p${i}.png`, body: png })),
    );
    expect(six.status).toBe(400);
    expect(six.body.error.message).toBe("Send at most 5 files at once.");
    expect(await t.db.ds.manager.count(StoredFile)).toBe(before);
    expect((await thread(s.owner, jobId)).messages).toEqual([]);
  });
});

describe("e-mail notices", () => {
  const minutes = (n: number) => new Date(Date.now() + n * 60_000);
  /** The notice e-mails queued for one job (the outbox is the record; the SMTP fake gets them too). */
  const queued = async (title: string) =>
    (await t.db.ds.manager.find(OutboxMessage)).filter((x) =>
      x.subject.endsWith(` on ${title}`),
    );
  const to = (rows: OutboxMessage[], address: string) =>
    rows.filter((x) => x.to === address);

  it("batches messages within the window into one e-mail per allowed person, never to the author or those who cannot see them", async () => {
    const { jobId, title } = await freshJob();
    await post(
      s.owner,
      jobId,
      "trades",
      "Scaffold tower on site Tuesday",
    ).expect(201);
    await post(s.owner, jobId, "trades", "Dust sheets are in the hall").expect(
      201,
    );
    // Inside the window nothing goes out.
    await t.sitecue.sendThreadNotices(minutes(1));
    expect(await queued(title)).toEqual([]);
    // Two processes sweeping at once still send each notice once.
    await Promise.all([
      t.sitecue.sendThreadNotices(minutes(6)),
      t.sitecue.sendThreadNotices(minutes(6)),
    ]);
    const rows = await queued(title);
    for (const who of ["fitter", "dev", "kit"] as const)
      expect(to(rows, email[who]), who).toHaveLength(1);
    expect(to(rows, email.owner)).toEqual([]); // the author
    expect(to(rows, email.rosa)).toEqual([]); // the customer does not see "Trades & workshop"
    expect(rows).toHaveLength(3);
    const mail = await t.mail.waitFor(
      (x) => x.to.includes(email.dev) && x.subject.endsWith(title),
      15_000,
    );
    expect(mail.subject).toBe(`2 new messages on ${title}`);
    expect(mail.text).toContain("Scaffold tower on site Tuesday");
    expect(mail.text).toContain("Dust sheets are in the hall");
    expect(mail.text).toContain(`${demoAccounts.owner.name} (Workshop)`);
    expect(mail.text).toContain(`http://localhost/jobs/${jobId}`);
    // A later sweep has nothing more to send.
    await t.sitecue.sendThreadNotices(minutes(12));
    expect(await queued(title)).toHaveLength(3);
  });

  it("sends workshop-only messages to the workshop alone, and skips people who read them meanwhile", async () => {
    const { jobId, title } = await freshJob();
    await post(s.fitter, jobId, "workshop", "Order more scribe fillets").expect(
      201,
    );
    await post(s.dev, jobId, "job", "Can I start at 07:30?").expect(201);
    // Rosa reads the thread before the notice is due.
    await s.rosa.agent
      .post(`/api/jobs/${jobId}/thread/read`)
      .set("X-CSRF-Token", s.rosa.csrf)
      .send({})
      .expect(200);
    await t.sitecue.sendThreadNotices(minutes(6));
    const rows = await queued(title);
    const owner = to(rows, email.owner);
    expect(owner).toHaveLength(1);
    expect(owner[0].subject).toBe(`2 new messages on ${title}`);
    expect(owner[0].text).toContain("Order more scribe fillets");
    // The fitter wrote the first, so theirs lists only Dev's.
    expect(to(rows, email.fitter)[0].subject).toBe(`New message on ${title}`);
    const kit = to(rows, email.kit);
    expect(kit).toHaveLength(1);
    expect(kit[0].text).toContain("Can I start at 07:30?");
    expect(kit[0].text).not.toContain("scribe fillets");
    expect(to(rows, email.dev)).toEqual([]); // the author of the other one
    expect(to(rows, email.rosa)).toEqual([]); // read it already
    // Every notice of the job is settled: none still due; Rosa's claimed without an e-mail.
    const notices = await t.db.ds.manager.findBy(ThreadNotice, { jobId });
    expect(notices.length).toBe(4); // owner, fitter, Kit, Rosa
    expect(notices.every((n) => n.dueAt === null)).toBe(true);
    expect(notices.filter((n) => n.lastSentAt !== null)).toHaveLength(3);
  });

  it("sends Whole job messages to the customer too, and none to a trade whose booking was cancelled meanwhile", async () => {
    const { jobId, title, bookingId } = await freshJob();
    await post(s.owner, jobId, "job", "Carpets are down on Friday").expect(201);
    await post(s.owner, jobId, "trades", "Dev: the coving is on hold").expect(
      201,
    );
    // Dev's booking is cancelled before the notice is due: he no longer sees the thread.
    await s.owner.agent
      .post(`/api/bookings/${bookingId}/cancel`)
      .set("X-CSRF-Token", s.owner.csrf)
      .send({ reason: "Customer postponed the coving" })
      .expect(200);
    await t.sitecue.sendThreadNotices(minutes(6));
    const rows = await queued(title);
    const rosaMail = to(rows, email.rosa);
    expect(rosaMail).toHaveLength(1);
    expect(rosaMail[0].subject).toBe(`New message on ${title}`);
    expect(rosaMail[0].text).toContain("Carpets are down on Friday");
    expect(rosaMail[0].text).not.toContain("coving is on hold");
    expect(to(rows, email.kit)[0].subject).toBe(`2 new messages on ${title}`);
    expect(to(rows, email.dev)).toEqual([]);
  });

  it("writes no notice for system notes", async () => {
    const { jobId, title, bookingId } = await freshJob();
    await s.owner.agent
      .post(`/api/bookings/${bookingId}/answer`)
      .set("X-CSRF-Token", s.owner.csrf)
      .send({ answer: "confirm", channel: "phone", note: "" })
      .expect(200);
    await t.sitecue.sendThreadNotices(minutes(6));
    expect(await queued(title)).toEqual([]);
    expect(await t.db.ds.manager.countBy(ThreadNotice, { jobId })).toBe(0);
  });
});
