// The maker's attention list (issue 8): each situation is built through the same routes the
// screens use (book, answer by link, propose, slip, double-book, post in the thread) and the item
// must appear with its sentence and its one fix, then go once the fix is made.
import request from "supertest";
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
  AttentionItem,
  AttentionResponse,
  ProgrammeResponse,
} from "../../../shared/schemas";
import { attentionKinds } from "../../../shared/schemas";
import { Booking } from "../bookings/bookings.entity";
import { Job } from "../jobs/jobs.entity";
import { localToday } from "../jobs/jobs.presenter";
import { Trade } from "../trades/trades.entity";
import { agoText } from "./attention.service";
import { createJobFromStarter } from "../../../tests/setup/jobs";

let t: TestApp;
let owner: Session;
let fitter: Session;
let alcoves: Job;
const today = localToday("Europe/London");

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  owner = await signIn(t, demoAccounts.owner.email);
  fitter = await signIn(t, demoAccounts.fitter.email);
  alcoves = await t.db.ds.manager.findOneByOrFail(Job, {
    title: demoJobTitles.alcoves,
  });
}, 120_000);
afterAll(async () => t?.close());

const attention = async (who: Session = owner): Promise<AttentionResponse> =>
  (
    await who.agent
      .get(`/api/workshops/${alcoves.workshopId}/attention`)
      .expect(200)
  ).body;
const itemsOf = async (jobId: string, who: Session = owner) =>
  (await attention(who)).items.filter((i) => i.job?.id === jobId);
const only = (items: AttentionItem[], kind: AttentionItem["kind"]) =>
  items.filter((i) => i.kind === kind);

const programme = async (jobId: string): Promise<ProgrammeResponse> =>
  (await owner.agent.get(`/api/jobs/${jobId}/programme`).expect(200)).body;
const taskNamed = (p: ProgrammeResponse, name: string) =>
  p.tasks.find((x) => x.name === name)!;
const trade = (name: string) =>
  t.db.ds.manager.findOneByOrFail(Trade, {
    businessName: name,
    workshopId: alcoves.workshopId,
  });

/** A job from the alcove starter, handover far enough out that nothing is at risk yet. */
async function starterJob(
  title: string,
  handoverDate = weekdaysFrom(today, 60),
) {
  const jobId = await createJobFromStarter(owner, {
    workshopId: alcoves.workshopId,
    customerId: alcoves.customerId,
    title,
    handoverDate,
  });
  return { jobId, p: await programme(jobId) };
}

async function firstFree(jobId: string, taskId: string, businessName: string) {
  const options = (
    await owner.agent
      .get(`/api/jobs/${jobId}/tasks/${taskId}/booking-options`)
      .expect(200)
  ).body;
  const o = options.trades.find(
    (x: { businessName: string }) => x.businessName === businessName,
  );
  return { tradeId: o.tradeId as string, start: o.firstFree.start as string };
}

async function book(
  jobId: string,
  taskId: string,
  businessName: string,
  extra: Record<string, unknown> = {},
) {
  const free = await firstFree(jobId, taskId, businessName);
  return (
    await owner.agent
      .post(`/api/jobs/${jobId}/bookings`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        taskId,
        tradeId: free.tradeId,
        start: free.start,
        arrivalWindow: "morning",
        ...extra,
      })
      .expect(201)
  ).body as { id: string; start: string; taskId: string };
}

/** The trade's side: the confirmation link, answered as the trade would (no account). */
async function byLink(bookingId: string) {
  const url: string = (
    await owner.agent.get(`/api/bookings/${bookingId}/link`).expect(200)
  ).body.url;
  const token = url.split("/b/")[1];
  const anon = request.agent(t.sitecue.app);
  const csrf = (await anon.get("/api/auth/session")).body.csrfToken;
  return {
    page: async () =>
      (await anon.get(`/api/booking-links/${token}`).expect(200)).body,
    answer: (body: Record<string, unknown>) =>
      anon
        .post(`/api/booking-links/${token}/answer`)
        .set("X-CSRF-Token", csrf)
        .send(body)
        .expect(200),
  };
}

describe("who may see it", () => {
  it("the owner and the fitter get the same list but for their own unread; the demo's unanswered bookings are on it", async () => {
    const a = await attention(owner);
    const b = await attention(fitter);
    const shared = (r: AttentionResponse) =>
      r.items.filter((i) => i.kind !== "unread").map((i) => i.id);
    expect(shared(b)).toEqual(shared(a));
    // Unread is per person: the demo's owner has not read the newest two alcove messages (the
    // plasterer's and the fitter's); the fitter, who wrote last, has read everything.
    expect(
      a.items
        .filter((i) => i.kind === "unread")
        .map((i) => [i.job?.title, i.sentence]),
    ).toEqual([
      [
        demoJobTitles.alcoves,
        expect.stringMatching(
          /^2 unread messages in the thread; the newest (.+ ago|on .+)\.$/,
        ),
      ],
    ]);
    expect(b.items.filter((i) => i.kind === "unread")).toEqual([]);
    expect(a.jobsChecked).toBe(3);
    const template = a.items.find(
      (i) => i.kind === "awaiting-answer" && i.task?.name === "Template coving",
    );
    expect(template).toMatchObject({
      job: { id: alcoves.id, title: demoJobTitles.alcoves },
      trade: { businessName: "Ashby Plaster & Coving", kind: "plasterer" },
    });
    expect(template!.sentence).toMatch(
      /^Ashby Plaster & Coving has not answered the booking for Template coving \((Mon|Tue|Wed|Thu|Fri) \d{1,2} [A-Z][a-z]{2}, morning\)\. Sent .+ ago\.$/,
    );
  });

  it("a trade and a customer of the workshop are refused (403), a stranger must sign in (401)", async () => {
    const dev = await signIn(t, demoAccounts.trade.email);
    const rosa = await signIn(t, demoAccounts.customer.email);
    const path = `/api/workshops/${alcoves.workshopId}/attention`;
    expect((await dev.agent.get(path)).status).toBe(403);
    expect((await rosa.agent.get(path)).status).toBe(403);
    const anon = await request(t.sitecue.app).get(path);
    expect(anon.status).toBe(401);
    expect(anon.body.error.code).toBeDefined();
  });
});

describe("bookings", () => {
  it("unbooked clear work → booked and unanswered → answered: each item comes and goes", async () => {
    const { jobId, p } = await starterJob("Attention: first booking");
    const template = taskNamed(p, "Template coving");
    const fixing = taskNamed(p, "Fix carcasses & scribes");
    // The template waits for the fixing: clear to start once the fixing is done.
    expect(
      p.result.tasks.find((x) => x.id === template.id)!.readiness.state,
    ).toBe("waiting");
    // Fixing done yesterday: the template is clear to start today, with nobody booked.
    const yesterday = weekdaysFrom(today, -1);
    await owner.agent
      .post(`/api/jobs/${jobId}/tasks/${fixing.id}/progress`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: p.version,
        actualStart: yesterday,
        actualFinish: yesterday,
      })
      .expect(200);
    const after = await programme(jobId);
    expect(
      after.result.tasks.find((x) => x.id === template.id)!.readiness.state,
    ).toBe("clear");
    let items = await itemsOf(jobId);
    const clear = only(items, "not-booked").find(
      (i) => i.task?.id === template.id,
    )!;
    expect(clear.sentence).toMatch(
      /^Template coving is clear to start \(planned from \w{3} \d{1,2} \w{3}\) and no plasterer is booked\.$/,
    );
    expect(clear.action).toEqual({
      label: "Book a plasterer",
      to: `/jobs/${jobId}?book=${template.id}#job-bookings`,
    });
    expect(clear.tone).toBe("wait");

    const b = await book(jobId, template.id, "Ashby Plaster & Coving");
    items = await itemsOf(jobId);
    expect(
      only(items, "not-booked").some((i) => i.task?.id === template.id),
    ).toBe(false);
    const waiting = only(items, "awaiting-answer").find(
      (i) => i.bookingId === b.id,
    )!;
    expect(waiting.sentence).toContain(
      "Ashby Plaster & Coving has not answered the booking for Template coving",
    );
    expect(waiting.sentence).toMatch(/Sent less than an hour ago\.$/);
    expect(waiting.waited).toBe("less than an hour ago");
    expect(waiting.action).toEqual({
      label: "Chase or record the answer",
      to: `/jobs/${jobId}?booking=${b.id}#job-bookings`,
    });

    // The trade confirms by the link: nothing about this booking is left.
    await (await byLink(b.id)).answer({ answer: "confirm" });
    items = await itemsOf(jobId);
    expect(items.some((i) => i.bookingId === b.id)).toBe(false);
  });

  it("a proposed date is there to accept or reject, and goes once accepted", async () => {
    const { jobId, p } = await starterJob("Attention: proposal");
    const template = taskNamed(p, "Template coving");
    const b = await book(jobId, template.id, "Ashby Plaster & Coving");
    const link = await byLink(b.id);
    const page = await link.page();
    const other: string = page.windowDates[1] ?? page.windowDates[0];
    await link.answer({ answer: "propose", proposedStart: other });
    const items = await itemsOf(jobId);
    const proposal = only(items, "date-proposed").find(
      (i) => i.bookingId === b.id,
    )!;
    const day = (d: string) =>
      new Intl.DateTimeFormat("en-GB", {
        weekday: "short",
        day: "numeric",
        month: "short",
        timeZone: "UTC",
      })
        .format(new Date(`${d.slice(0, 10)}T12:00:00Z`))
        .replace(",", "");
    expect(proposal.sentence).toBe(
      `Ashby Plaster & Coving proposes ${day(other)} instead of ${day(b.start)} for Template coving: accept or reject it. Proposed less than an hour ago.`,
    );
    expect(proposal.action).toEqual({
      label: "Answer Ashby Plaster & Coving",
      to: `/jobs/${jobId}?booking=${b.id}#job-bookings`,
    });
    // The proposal replaces the "no answer yet" item: the booking is not both.
    expect(
      items.some((i) => i.kind === "awaiting-answer" && i.bookingId === b.id),
    ).toBe(false);
    await owner.agent
      .post(`/api/bookings/${b.id}/proposal`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ accept: true })
      .expect(200);
    expect((await itemsOf(jobId)).some((i) => i.bookingId === b.id)).toBe(
      false,
    );
  });

  it("a decline offers the next trade of that kind, and goes once another is booked", async () => {
    const { jobId, p } = await starterJob("Attention: decline");
    const template = taskNamed(p, "Template coving");
    const b = await book(jobId, template.id, "Ashby Plaster & Coving");
    await (
      await byLink(b.id)
    ).answer({
      answer: "decline",
      reason: "Away that week",
    });
    let items = await itemsOf(jobId);
    const declined = only(items, "declined").find((i) => i.bookingId === b.id)!;
    expect(declined.sentence).toMatch(
      /^Ashby Plaster & Coving declined Template coving \(\w{3} \d{1,2} \w{3}\); nobody is booked for it\. Declined less than an hour ago\.$/,
    );
    expect(declined.tone).toBe("risk");
    expect(declined.action).toEqual({
      label: "Book the next plasterer",
      to: `/jobs/${jobId}?booking=${b.id}&open=book-another#job-bookings`,
    });
    // Not also offered as "not booked": the decline is the one item for the task.
    expect(
      only(items, "not-booked").some((i) => i.task?.id === template.id),
    ).toBe(false);
    // The fix: another plasterer from the booking options.
    const ridge = await owner.agent
      .post(`/api/workshops/${alcoves.workshopId}/trades`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        businessName: "Ridge Plastering (attention)",
        kind: "plasterer",
        contactName: "Jo Ridge",
        email: "jo@ridge-attention.example.test",
        phone: "01632 960 812",
      })
      .expect(201);
    const next = await book(jobId, template.id, ridge.body.businessName);
    items = await itemsOf(jobId);
    expect(items.some((i) => i.kind === "declined")).toBe(false);
    expect(
      only(items, "awaiting-answer").some((i) => i.bookingId === next.id),
    ).toBe(true);
  });
});

describe("the programme", () => {
  it("a slip past handover: the moved booking needs re-confirming and handover is at risk by the engine's float; cancelling the late booking clears both", async () => {
    const handover = weekdaysFrom(today, 25);
    const { jobId, p } = await starterJob("Attention: slip", handover);
    const second = taskNamed(p, "Electrician second fix");
    const b = await book(jobId, second.id, "Brightwire Electrical", {
      arrivalWindow: "afternoon",
    });
    await owner.agent
      .post(`/api/bookings/${b.id}/answer`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ answer: "confirm", channel: "phone" })
      .expect(200);
    expect(only(await itemsOf(jobId), "handover-at-risk")).toHaveLength(0);

    // Sprayed doors late: Hang doors not before a day well past handover.
    const now = await programme(jobId);
    const doors = taskNamed(now, "Hang doors");
    const lateDay = weekdaysFrom(handover, 3);
    await owner.agent
      .post(`/api/jobs/${jobId}/programme/apply`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: now.version,
        changes: [{ taskId: doors.id, notEarlierThan: lateDay }],
      })
      .expect(200);
    const slipped = await programme(jobId);
    const items = await itemsOf(jobId);

    const reconfirm = only(items, "needs-reconfirming").find(
      (i) => i.bookingId === b.id,
    )!;
    expect(reconfirm.sentence).toMatch(
      /^Brightwire Electrical has not re-confirmed Electrician second fix since its dates moved: now \w{3} \d{1,2} \w{3}, (morning|afternoon)\. Asked less than an hour ago\.$/,
    );
    // The arrival follows the re-booked slot (issue 16), not the old afternoon.
    const rebooked = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: b.id,
    });
    expect(reconfirm.sentence).toContain(
      rebooked.start.slice(11, 16) >= "12:00" ? ", afternoon." : ", morning.",
    );
    expect(reconfirm.action).toMatchObject({
      to: `/jobs/${jobId}?booking=${b.id}#job-bookings`,
    });

    // By how much: the most negative total float the engine gives this programme.
    const floats = slipped.result.tasks.map((x) => x.totalFloatDays);
    const behind = -Math.min(...floats);
    expect(behind).toBeGreaterThan(0);
    const worst = slipped.result.tasks
      .filter((x) => x.totalFloatDays === -behind)
      .sort((x, y) => x.plannedStart.localeCompare(y.plannedStart))[0];
    const risk = only(items, "handover-at-risk");
    expect(risk).toHaveLength(1);
    expect(risk[0].task?.id).toBe(worst.id);
    expect(risk[0].sentence).toMatch(
      new RegExp(
        `^Agreed handover on \\w{3} \\d{1,2} \\w{3} is at risk: .+ is ${behind} working days? behind what it allows\\.$`,
      ),
    );
    expect(risk[0].action).toEqual({
      label: "See it on the programme",
      to: `/jobs/${jobId}/programme?task=${worst.id}`,
    });
    // The programme in trouble comes first.
    expect(items[0].kind).toBe("handover-at-risk");

    // The booking stays pinned at its new, late dates (the engine never moves a pin), so moving
    // the doors back is not enough: the fix is to cancel the late booking and book again.
    await owner.agent
      .post(`/api/jobs/${jobId}/programme/apply`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: slipped.version,
        changes: [{ taskId: doors.id, notEarlierThan: null }],
      })
      .expect(200);
    expect(only(await itemsOf(jobId), "handover-at-risk")).toHaveLength(1);
    await owner.agent
      .post(`/api/bookings/${b.id}/cancel`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ reason: "Dates no longer work" })
      .expect(200);
    const fixed = await itemsOf(jobId);
    expect(only(fixed, "handover-at-risk")).toHaveLength(0);
    expect(fixed.some((i) => i.bookingId === b.id)).toBe(false);
  });

  it("a double booking shows as a clash on both jobs in the engine's words, and goes when cancelled", async () => {
    const { jobId, p } = await starterJob("Attention: clash");
    const decorator = await trade("Kestrel Decorating");
    const demoPaint = await t.db.ds.manager.findOneByOrFail(Booking, {
      tradeId: decorator.id,
      jobId: alcoves.id,
    });
    const paint = taskNamed(p, "Fill, caulk & paint");
    const b = (
      await owner.agent
        .post(`/api/jobs/${jobId}/bookings`)
        .set("X-CSRF-Token", owner.csrf)
        .send({
          taskId: paint.id,
          tradeId: decorator.id,
          start: demoPaint.start,
          arrivalWindow: "all-day",
          overrideReason: "Checking the attention list",
        })
        .expect(201)
    ).body;
    const all = (await attention()).items;
    const here = all.find((i) => i.kind === "clash" && i.job?.id === jobId)!;
    const there = all.find(
      (i) => i.kind === "clash" && i.job?.id === alcoves.id,
    )!;
    // The engine names the other booking: its business, day and job.
    const engine = (await programme(jobId)).result.tasks
      .find((x) => x.id === paint.id)!
      .problems.find((x) => x.code === "clash")!.message;
    expect(here.sentence).toBe(`Clash on Fill, caulk & paint: ${engine}.`);
    expect(here.sentence).toMatch(/Kestrel Decorating is already booked/);
    expect(here.sentence).toContain(demoJobTitles.alcoves);
    expect(here.action).toEqual({
      label: "Move it on the programme",
      to: `/jobs/${jobId}/programme?task=${paint.id}`,
    });
    expect(there.sentence).toContain("Attention: clash");
    expect(here.trade?.businessName).toBe("Kestrel Decorating");

    await owner.agent
      .post(`/api/bookings/${b.id}/cancel`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ reason: "Double booked" })
      .expect(200);
    const after = (await attention()).items;
    expect(
      after.some(
        (i) =>
          i.kind === "clash" &&
          (i.job?.id === jobId || i.job?.id === alcoves.id),
      ),
    ).toBe(false);
  });
});

describe("the customer's away dates", () => {
  it("a booking on days the customer will be away is flagged, and goes when the dates change", async () => {
    const { jobId, p } = await starterJob("Attention: customer away");
    const template = taskNamed(p, "Template coving");
    const b = await book(jobId, template.id, "Ashby Plaster & Coving");
    const day = b.start.slice(0, 10);
    // The customer enters the dates herself (the timeline's route).
    const rosa = await signIn(t, demoAccounts.customer.email);
    await rosa.agent
      .put(`/api/jobs/${jobId}/away-dates`)
      .set("X-CSRF-Token", rosa.csrf)
      .send({ ranges: [{ from: day, to: day }] })
      .expect(200);
    const items = await itemsOf(jobId);
    const away = only(items, "customer-away").find(
      (i) => i.bookingId === b.id,
    )!;
    expect(away.sentence).toMatch(
      /^Ashby Plaster & Coving is booked for Template coving on \w{3} \d{1,2} \w{3}, when the customer is away\. Move or cancel the booking\.$/,
    );
    expect(away.tone).toBe("risk");
    expect(away.action).toEqual({
      label: "Open the booking",
      to: `/jobs/${jobId}?booking=${b.id}#job-bookings`,
    });
    await rosa.agent
      .put(`/api/jobs/${jobId}/away-dates`)
      .set("X-CSRF-Token", rosa.csrf)
      .send({ ranges: [] })
      .expect(200);
    expect(only(await itemsOf(jobId), "customer-away")).toHaveLength(0);
  });
});

describe("the thread", () => {
  it("unread messages per job, from the thread's own counts; gone once read", async () => {
    const { jobId } = await starterJob("Attention: thread");
    // Read what the job's creation left, so the count below is the fitter's message alone.
    await owner.agent
      .post(`/api/jobs/${jobId}/thread/read`)
      .set("X-CSRF-Token", owner.csrf)
      .send({})
      .expect(200);
    for (const text of ["Doors are at the spray shop", "Back on Friday"])
      await fitter.agent
        .post(`/api/jobs/${jobId}/thread/messages`)
        .set("X-CSRF-Token", fitter.csrf)
        .send({ audience: "workshop", text })
        .expect(201);
    const unread = only(await itemsOf(jobId), "unread");
    expect(unread).toHaveLength(1);
    expect(unread[0].sentence).toBe(
      "2 unread messages in the thread; the newest less than an hour ago.",
    );
    expect(unread[0].action).toEqual({
      label: "Read the thread",
      to: `/jobs/${jobId}#job-thread`,
    });
    // The author has nothing unread there.
    expect(only(await itemsOf(jobId, fitter), "unread")).toHaveLength(0);
    await owner.agent
      .post(`/api/jobs/${jobId}/thread/read`)
      .set("X-CSRF-Token", owner.csrf)
      .send({})
      .expect(200);
    expect(only(await itemsOf(jobId), "unread")).toHaveLength(0);
  });
});

describe("order and wording", () => {
  it("is most urgent first by the documented rule: kind, then the soonest work", async () => {
    const { items } = await attention();
    const rank = items.map((i) => attentionKinds.indexOf(i.kind));
    expect(rank).toEqual([...rank].sort((a, b) => a - b));
    // Within a kind, the work that comes soonest: the demo's template (next working day) is
    // asked before the second fix (three working days out).
    const at = (task: string) =>
      items.findIndex(
        (i) =>
          i.kind === "awaiting-answer" &&
          i.job?.id === alcoves.id &&
          i.task?.name === task,
      );
    expect(at("Template coving")).toBeGreaterThanOrEqual(0);
    expect(at("Template coving")).toBeLessThan(at("Electrician second fix"));
    for (const i of items) {
      expect(i.sentence).toMatch(/[.]$/);
      expect(i.job).not.toBeNull();
      expect(
        "to" in i.action && i.action.to.startsWith(`/jobs/${i.job?.id}`),
      ).toBe(true);
    }
  });

  it("says how long in hours under a day, then in working days with weekends and bank holidays left out", () => {
    const cal = { id: "workshop", holidayRegion: "GB-ENG" as const };
    const at = (s: string) => new Date(s);
    expect(
      agoText(
        at("2026-12-02T09:30:00Z"),
        at("2026-12-02T10:00:00Z"),
        "Europe/London",
        cal,
      ),
    ).toBe("less than an hour ago");
    expect(
      agoText(
        at("2026-12-02T05:00:00Z"),
        at("2026-12-02T10:00:00Z"),
        "Europe/London",
        cal,
      ),
    ).toBe("5 hours ago");
    // Fri 4 Dec 2026 → Tue 8 Dec: Mon and Tue are the working days since.
    expect(
      agoText(
        at("2026-12-04T10:00:00Z"),
        at("2026-12-08T10:00:00Z"),
        "Europe/London",
        cal,
      ),
    ).toBe("2 working days ago");
    // GOV.UK bank holidays (England and Wales): Fri 25 and Mon 28 Dec 2026 (Boxing Day substitute).
    // Thu 24 → Tue 29 Dec: only Tue 29 is a working day.
    expect(
      agoText(
        at("2026-12-24T10:00:00Z"),
        at("2026-12-29T10:00:00Z"),
        "Europe/London",
        cal,
      ),
    ).toBe("1 working day ago");
    // Fri evening → Sun: no working day since, so the day is named.
    expect(
      agoText(
        at("2026-12-04T17:00:00Z"),
        at("2026-12-06T18:00:00Z"),
        "Europe/London",
        cal,
      ),
    ).toBe("on Fri 4 Dec");
  });
});

describe("speed", () => {
  it("answers for a workshop with 20 open jobs in well under a second", async () => {
    const { jobsChecked } = await attention();
    const extra = Math.max(0, 20 - jobsChecked);
    for (let i = 0; i < extra; i++)
      await starterJob(`Attention: load ${i + 1}`);
    expect((await attention()).jobsChecked).toBeGreaterThanOrEqual(20);
    const times: number[] = [];
    for (let i = 0; i < 5; i++) {
      const t0 = performance.now();
      await attention();
      times.push(performance.now() - t0);
    }
    times.sort((a, b) => a - b);
    const median = times[2];
    console.info(
      `attention list, ${jobsChecked + extra}+ open jobs: median ${median.toFixed(0)} ms (${times.map((x) => x.toFixed(0)).join(", ")})`,
    );
    expect(median).toBeLessThan(1000);
  });
});
