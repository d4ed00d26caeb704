// Booking trades end to end through the API (issue 5; the brief's scenarios 1, 2, 4 and 6).
// Every captured invitation's calendar part is parsed back with ical.js, the reference parser.
import ICAL from "ical.js";
import nodemailer from "nodemailer";
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
  BookingResponse,
  CaughtMail,
  ProgrammeResponse,
} from "../../../shared/schemas";
import { Job } from "../jobs/jobs.entity";
import { Trade } from "../trades/trades.entity";
import { Booking, BookingEvent } from "./bookings.entity";
import { buildItipReply } from "./itip-reply";
import { createJobFromStarter } from "../../../tests/setup/jobs";

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

const programme = async (jobId: string): Promise<ProgrammeResponse> =>
  (await owner.agent.get(`/api/jobs/${jobId}/programme`).expect(200)).body;
const taskNamed = (p: ProgrammeResponse, name: string) =>
  p.tasks.find((x) => x.name === name)!;
/** A trade of the demo workshop by name (another workshop may have one of the same name). */
const trade = (name: string) =>
  t.db.ds.manager.findOneByOrFail(Trade, {
    businessName: name,
    workshopId: alcoves.workshopId,
  });

interface Option {
  tradeId: string;
  businessName: string;
  firstFree: { start: string };
}
/** The demo plasterer among a task's booking options (another plasterer joins later in this file). */
const ashby = (options: { trades: Option[] }) =>
  options.trades.find((x) => x.businessName === "Ashby Plaster & Coving")!;

/** The VEVENT of a captured mail's calendar part, parsed by ical.js. */
function eventOf(mail: CaughtMail) {
  const part = mail.calendars[0];
  expect(part, `calendar part in "${mail.subject}"`).toBeDefined();
  const cal = new ICAL.Component(ICAL.parse(part.content));
  return {
    cal,
    event: cal.getFirstSubcomponent("vevent")!,
    method: part.method,
    raw: part.content,
  };
}

const mailTo = (to: string, pred: (m: CaughtMail) => boolean) =>
  t.mail.waitFor((m) => m.to.includes(to) && pred(m), 15000);

/** A job from the alcove starter with the fixing done, so the coving template is clear to start. */
async function readyJob(
  title: string,
): Promise<{ jobId: string; p: ProgrammeResponse }> {
  const jobId = await createJobFromStarter(owner, {
    workshopId: alcoves.workshopId,
    customerId: alcoves.customerId,
    title,
  });
  return { jobId, p: await programme(jobId) };
}

describe("scenario 1: book the plasterer after the carcasses are fixed", () => {
  it("proposes the plasterer's first free start after the fixing, and the window that keeps handover", async () => {
    const { jobId, p } = await readyJob("Booking: options");
    const template = taskNamed(p, "Template coving");
    const fixResult = p.result.tasks.find(
      (x) => x.id === taskNamed(p, "Fix carcasses & scribes").id,
    )!;
    const res = await owner.agent
      .get(`/api/jobs/${jobId}/tasks/${template.id}/booking-options`)
      .expect(200);
    expect(res.body.taskName).toBe("Template coving");
    expect(
      res.body.trades.map((x: { businessName: string }) => x.businessName),
    ).toEqual(["Ashby Plaster & Coving"]);
    const free = res.body.trades[0].firstFree;
    // FS after the fixing's finish: the template can start no earlier than that.
    expect(free.start >= fixResult.earlyFinish.slice(0, 10)).toBe(true);
    expect(res.body.earliestStart <= free.start).toBe(true);
  });

  it("sends an e-mail with a real iCalendar invitation and a confirmation link", async () => {
    const { jobId, p } = await readyJob("Booking: invitation");
    const template = taskNamed(p, "Template coving");
    const options = (
      await owner.agent.get(
        `/api/jobs/${jobId}/tasks/${template.id}/booking-options`,
      )
    ).body;
    const start = ashby(options).firstFree.start;
    const res = await owner.agent
      .post(`/api/jobs/${jobId}/bookings`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        taskId: template.id,
        tradeId: ashby(options).tradeId,
        start,
        arrivalWindow: "morning",
      });
    expect(res.status).toBe(201);
    expect(res.body.state).toBe("sent");
    const mail = await mailTo(
      demoAccounts.trade.email,
      (m) =>
        m.subject.includes("Template coving") &&
        m.subject.includes("Example Row"),
    );
    expect(mail.text).toMatch(/Template coving/);
    expect(mail.text).toMatch(/It waits for Fix carcasses & scribes/);
    expect(mail.html).toBeTruthy();
    const link = mail.links.find((l) => l.includes("/b/"));
    expect(link).toBeDefined();
    const { event, method, cal } = eventOf(mail);
    // RFC 6047 §2.4 / RFC 5546: the part's method equals the object's METHOD.
    expect(method?.toUpperCase()).toBe("REQUEST");
    expect(cal.getFirstPropertyValue("method")).toBe("REQUEST");
    expect(event.getFirstPropertyValue("uid")).toMatch(/^[0-9a-f-]{36}$/); // RFC 7986 §5.3: a random UUID
    expect(event.getFirstPropertyValue("sequence")).toBe(0); // RFC 5546 §2.1.4: starts at 0
    expect(event.getFirstPropertyValue("status")).toBe("CONFIRMED");
    // The mailto scheme is case-insensitive (RFC 3986 §3.1).
    expect(String(event.getFirstPropertyValue("organizer")).toLowerCase()).toBe(
      `mailto:booking-${res.body.id}@replies.sitecue.example.test`,
    );
    const attendee = event.getFirstProperty("attendee")!;
    expect(String(attendee.getFirstValue()).toLowerCase()).toBe(
      `mailto:${demoAccounts.trade.email}`,
    );
    expect(attendee.getParameter("rsvp")).toBe("TRUE");
    expect(attendee.getParameter("partstat")).toBe("NEEDS-ACTION");
    // Not confirmed yet: the location is the area only.
    expect(event.getFirstPropertyValue("location")).toBe(
      "Example Row, Wetherfold",
    );
    expect(event.getFirstSubcomponent("valarm")).toBeTruthy();
  });
});

describe("scenario 2: a trade confirms by link", () => {
  async function sentBooking(title: string) {
    const { jobId, p } = await readyJob(title);
    const template = taskNamed(p, "Template coving");
    const options = (
      await owner.agent.get(
        `/api/jobs/${jobId}/tasks/${template.id}/booking-options`,
      )
    ).body;
    const booking = (
      await owner.agent
        .post(`/api/jobs/${jobId}/bookings`)
        .set("X-CSRF-Token", owner.csrf)
        .send({
          taskId: template.id,
          tradeId: ashby(options).tradeId,
          start: ashby(options).firstFree.start,
          arrivalWindow: "range",
          arrivalFrom: "08:00",
          arrivalTo: "09:00",
        })
        .expect(201)
    ).body;
    const url: string = (
      await owner.agent.get(`/api/bookings/${booking.id}/link`).expect(200)
    ).body.url;
    return { jobId, booking, token: url.split("/b/")[1] };
  }

  it("shows the area only, then the full address once confirmed; a repeat click shows the answer", async () => {
    const { jobId, booking, token } = await sentBooking(
      "Booking: confirm by link",
    );
    const anon = request.agent(t.sitecue.app);
    const csrf = (await anon.get("/api/auth/session")).body.csrfToken;
    const page = (await anon.get(`/api/booking-links/${token}`).expect(200))
      .body;
    expect(page).toMatchObject({
      status: "current",
      state: "sent",
      taskName: "Template coving",
      jobArea: "Example Row, Wetherfold",
      siteAddress: null,
      accessNotes: null,
      canAnswer: true,
    });
    expect(page.waitsOn.map((w: { name: string }) => w.name)).toEqual([
      "Fix carcasses & scribes",
    ]);
    expect(page.windowDates.length).toBeGreaterThan(0);
    expect(page.caution).toMatch(/Work at height/);
    const confirmed = (
      await anon
        .post(`/api/booking-links/${token}/answer`)
        .set("X-CSRF-Token", csrf)
        .send({ answer: "confirm" })
        .expect(200)
    ).body;
    expect(confirmed.state).toBe("confirmed");
    expect(confirmed.siteAddress).toBe("9 Example Row, Wetherfold, QX9 9AB");
    // The maker sees it at once, with how it came.
    const mine = (
      await owner.agent.get(`/api/jobs/${jobId}/bookings`)
    ).body.bookings.find((b: { id: string }) => b.id === booking.id);
    expect(mine.state).toBe("confirmed");
    expect(mine.history.at(-1)).toMatchObject({
      toState: "confirmed",
      channel: "link",
      who: "Ashby Plaster & Coving",
    });
    await mailTo(demoAccounts.owner.email, (m) =>
      m.subject.startsWith("Ashby Plaster & Coving confirmed"),
    );
    // The trade gets the confirmed invitation with the full address: the same UID and SEQUENCE
    // (no date changed, RFC 5546 §2.1.4), PARTSTAT=ACCEPTED (issue 16).
    const stored = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: booking.id,
    });
    const confirmedMail = await mailTo(
      demoAccounts.trade.email,
      (m) =>
        m.subject.includes("is confirmed for") &&
        m.text.includes("9 Example Row"),
    );
    const { event } = eventOf(confirmedMail);
    expect(event.getFirstPropertyValue("uid")).toBe(stored.icalUid);
    expect(event.getFirstPropertyValue("sequence")).toBe(stored.sequence);
    expect(String(event.getFirstPropertyValue("location"))).toContain(
      "9 Example Row, Wetherfold",
    );
    expect(event.getFirstProperty("attendee")!.getParameter("partstat")).toBe(
      "ACCEPTED",
    );
    // A repeat click shows the answer again and changes nothing.
    const again = (
      await anon
        .post(`/api/booking-links/${token}/answer`)
        .set("X-CSRF-Token", csrf)
        .send({ answer: "confirm" })
        .expect(200)
    ).body;
    expect(again.answeredAt).toBe(confirmed.answeredAt);
  });

  it("refuses a tampered link with a clear message and changes nothing", async () => {
    const { token } = await sentBooking("Booking: tampered link");
    const res = await request(t.sitecue.app).get(
      `/api/booking-links/${token.slice(0, -2)}xx`,
    );
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe("token-invalid");
    expect(res.body.error.message).toMatch(/not valid or has expired/);
  });

  it("a link used after the booking was cancelled says the workshop cancelled it, and on which day; nothing to confirm", async () => {
    const { booking, token } = await sentBooking("Booking: cancelled link");
    const anon = request.agent(t.sitecue.app);
    const csrf = (await anon.get("/api/auth/session")).body.csrfToken;
    await owner.agent
      .post(`/api/bookings/${booking.id}/cancel`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ reason: "Customer postponed" })
      .expect(200);
    const job = await t.db.ds.manager.findOneByOrFail(Job, {
      id: booking.jobId,
    });
    // Today in the job's zone, as "Thu 5 Mar 2026" (Intl, independent of the server's words).
    const parts = new Intl.DateTimeFormat("en-CA", {
      timeZone: job.timeZone,
    }).format(new Date());
    const today = new Intl.DateTimeFormat("en-GB", {
      weekday: "short",
      day: "numeric",
      month: "short",
      year: "numeric",
      timeZone: job.timeZone,
    })
      .format(new Date())
      .replace(",", "");
    // The trade presses Confirm on the page they opened before the cancel.
    const answer = await anon
      .post(`/api/booking-links/${token}/answer`)
      .set("X-CSRF-Token", csrf)
      .send({ answer: "confirm" });
    expect(answer.status).toBe(409);
    expect(answer.body.error.message).toBe(
      `Hollin & Vane Joinery cancelled this booking on ${today}, so there is nothing to confirm.`,
    );
    expect(answer.body.error.message).not.toMatch(/dates/);
    // The page (re-read after a 409) says who cancelled it and when, and offers no answer.
    const page = (await anon.get(`/api/booking-links/${token}`).expect(200))
      .body;
    expect(page).toMatchObject({
      status: "cancelled",
      state: "cancelled",
      cancelledOn: parts,
      canAnswer: false,
    });
    expect(
      (await t.db.ds.manager.findOneByOrFail(Booking, { id: booking.id }))
        .state,
    ).toBe("cancelled");
  });

  it("copy link on a visit whose days are over says the visit is over (410), not an expired link", async () => {
    const { jobId, booking } = await sentBooking("Booking: visit over");
    // The visit's days go by: Mon 6 Jan 2025, its link expiring a week later (linkExpiry).
    await t.db.ds.manager.update(
      Booking,
      { id: booking.id },
      {
        start: "2025-01-06T08:00",
        finish: "2025-01-06T16:30",
        linkForStart: "2025-01-06T08:00",
        linkExpiresAt: new Date("2025-01-13T23:59:59Z"),
      },
    );
    // The job page is told, so it offers no Copy link for it (a current visit keeps its button).
    expect(booking.visitOver).toBe(false);
    const listed: BookingResponse[] = (
      await owner.agent.get(`/api/jobs/${jobId}/bookings`).expect(200)
    ).body.bookings;
    expect(listed.find((b) => b.id === booking.id)?.visitOver).toBe(true);
    const res = await owner.agent.get(`/api/bookings/${booking.id}/link`);
    expect(res.status).toBe(410);
    expect(res.body.error).toEqual({
      code: "gone",
      message:
        "This visit is over: it ended on Mon 6 Jan 2025, so there is nothing to confirm and no link to send.",
    });
  });

  it("a proposal the maker accepts moves the booking, confirmed, with an updated invitation (SEQUENCE up)", async () => {
    const { jobId, booking, token } = await sentBooking("Booking: proposal");
    const anon = request.agent(t.sitecue.app);
    const csrf = (await anon.get("/api/auth/session")).body.csrfToken;
    const page = (await anon.get(`/api/booking-links/${token}`)).body;
    // A day the trade is free (other tests in this file book them too): accepting a start they
    // are booked for elsewhere is refused as a clash (issue 13, item 3).
    const other = page.freeDates.find(
      (d: string) => d !== booking.start.slice(0, 10),
    );
    const proposed = (
      await anon
        .post(`/api/booking-links/${token}/answer`)
        .set("X-CSRF-Token", csrf)
        .send({ answer: "propose", proposedStart: other })
        .expect(200)
    ).body;
    expect(proposed.state).toBe("date-proposed");
    const accepted = await owner.agent
      .post(`/api/bookings/${booking.id}/proposal`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ accept: true });
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200);
    expect(accepted.body).toMatchObject({ state: "confirmed", sequence: 1 });
    expect(accepted.body.start.slice(0, 10)).toBe(other);
    const uid = (
      await t.db.ds.manager.findOneByOrFail(Booking, { id: booking.id })
    ).icalUid;
    // This booking's mail with the accepted dates (its confirmed invitation after the proposal).
    const mail = await mailTo(
      demoAccounts.trade.email,
      (m) =>
        m.subject.includes(`is confirmed for`) &&
        m.text.includes("Nothing more to do") &&
        m.calendars.length > 0 &&
        eventOf(m).event.getFirstPropertyValue("uid") === uid &&
        Number(eventOf(m).event.getFirstPropertyValue("sequence")) === 1,
    );
    // Their own proposal, accepted: they are not asked to confirm again (issue 16).
    expect(mail.text).not.toMatch(/confirm again/i);
    expect(mail.text).not.toContain("accepting or declining it");
    // The proposal was a date: their day's start, 08:00, where the 08:00–09:00 arrival still fits.
    expect(accepted.body).toMatchObject({
      arrivalWindow: "range",
      arrivalFrom: "08:00",
    });
    const { event } = eventOf(mail);
    expect(event.getFirstPropertyValue("sequence")).toBe(1);
    expect(event.getFirstPropertyValue("uid")).toBe(
      (await t.db.ds.manager.findOneByOrFail(Booking, { id: booking.id }))
        .icalUid,
    );
    expect(jobId).toBeTruthy();
  });

  it("a decline frees the task and offers the next trade, and the customer no longer sees the visit", async () => {
    const { jobId, booking, token } = await sentBooking("Booking: decline");
    const anon = request.agent(t.sitecue.app);
    const csrf = (await anon.get("/api/auth/session")).body.csrfToken;
    const noReason = await anon
      .post(`/api/booking-links/${token}/answer`)
      .set("X-CSRF-Token", csrf)
      .send({ answer: "decline" });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.fields.reason).toBeDefined();
    await anon
      .post(`/api/booking-links/${token}/answer`)
      .set("X-CSRF-Token", csrf)
      .send({ answer: "decline", reason: "On holiday that week" })
      .expect(200);
    // A second plasterer now exists; the options put them first, the decliner last.
    const second = await owner.agent
      .post(`/api/workshops/${alcoves.workshopId}/trades`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        businessName: "Ridge Plastering",
        kind: "plasterer",
        contactName: "Jo Ridge",
        email: "jo@ridgeplastering.example.test",
        phone: "01632 960 811",
      })
      .expect(201);
    const options = (
      await owner.agent.get(
        `/api/jobs/${jobId}/tasks/${booking.taskId}/booking-options`,
      )
    ).body;
    expect(
      options.trades.map((x: { businessName: string; declined: boolean }) => [
        x.businessName,
        x.declined,
      ]),
    ).toEqual([
      ["Ridge Plastering", false],
      ["Ashby Plaster & Coving", true],
    ]);
    expect(options.trades[0].firstFree).not.toBeNull();
    const rebook = await owner.agent
      .post(`/api/jobs/${jobId}/bookings`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        taskId: booking.taskId,
        tradeId: second.body.id,
        start: options.trades[0].firstFree.start,
        arrivalWindow: "morning",
        send: false,
      });
    expect(rebook.status).toBe(201);
    const rosa = await signIn(t, demoAccounts.customer.email);
    const view = (await rosa.agent.get(`/api/jobs/${jobId}`).expect(200)).body;
    expect(view.bookings.some((b: { id: string }) => b.id === booking.id)).toBe(
      false,
    );
  });

  it("the maker records an answer given by phone, with how it came", async () => {
    const { booking } = await sentBooking("Booking: by phone");
    const res = await owner.agent
      .post(`/api/bookings/${booking.id}/answer`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ answer: "confirm", channel: "phone", note: "Dev rang at 17:40" });
    expect(res.status).toBe(200);
    expect(res.body.state).toBe("confirmed");
    expect(res.body.history.at(-1)).toMatchObject({
      channel: "phone",
      who: demoAccounts.owner.name,
      note: "Dev rang at 17:40",
    });
  });
});

describe("answers from the trade's own calendar app (iTIP REPLY by e-mail)", () => {
  async function sendReply(
    from: string,
    bookingId: string,
    uid: string,
    sequence: number,
    partstat: "ACCEPTED" | "DECLINED" | "TENTATIVE",
    counterStart?: string,
    envelopeFrom = from,
  ) {
    const ics = buildItipReply({
      uid,
      sequence,
      organizerEmail: `booking-${bookingId}@replies.sitecue.example.test`,
      attendee: { name: "Ashby Plaster & Coving", email: from },
      partstat,
      stamp: new Date(),
      counterStart,
    });
    const transport = nodemailer.createTransport({
      host: "127.0.0.1",
      port: t.inbound.port,
      secure: false,
      ignoreTLS: true,
    });
    try {
      await transport.sendMail({
        from,
        envelope: {
          from: envelopeFrom,
          to: `booking-${bookingId}@replies.sitecue.example.test`,
        },
        to: `booking-${bookingId}@replies.sitecue.example.test`,
        subject: "Accepted: Template coving",
        text: "Accepted",
        icalEvent: { method: counterStart ? "COUNTER" : "REPLY", content: ics },
      });
    } finally {
      transport.close();
    }
  }

  /** A fresh job's template, booked with Ashby and sent: the booking and its stored row. */
  async function sentTemplate(title: string) {
    const { jobId, p } = await readyJob(title);
    const template = taskNamed(p, "Template coving");
    const options = (
      await owner.agent.get(
        `/api/jobs/${jobId}/tasks/${template.id}/booking-options`,
      )
    ).body;
    const booking = (
      await owner.agent
        .post(`/api/jobs/${jobId}/bookings`)
        .set("X-CSRF-Token", owner.csrf)
        .send({
          taskId: template.id,
          tradeId: ashby(options).tradeId,
          start: ashby(options).firstFree.start,
          arrivalWindow: "morning",
        })
        .expect(201)
    ).body;
    const stored = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: booking.id,
    });
    return { booking: booking as BookingResponse, stored };
  }

  it("records an Accept from the invited trade, and refuses one from another address", async () => {
    const { booking, stored } = await sentTemplate("Booking: calendar reply");
    // RFC 6047 §2.2.1: only the invited attendee may answer for themselves.
    await expect(
      sendReply(
        "someone.else@example.test",
        booking.id,
        stored.icalUid,
        stored.sequence,
        "ACCEPTED",
      ),
    ).rejects.toThrow(/Only the invited trade/);
    // The From: header alone is not enough: the SMTP envelope sender must be the trade too.
    await expect(
      sendReply(
        demoAccounts.trade.email,
        booking.id,
        stored.icalUid,
        stored.sequence,
        "ACCEPTED",
        undefined,
        "someone.else@example.test",
      ),
    ).rejects.toThrow(/Only the invited trade/);
    expect(
      (await t.db.ds.manager.findOneByOrFail(Booking, { id: booking.id }))
        .state,
    ).toBe("sent");
    // A reply to another sequence is stale (RFC 5546 §2.1.5).
    await expect(
      sendReply(
        demoAccounts.trade.email,
        booking.id,
        stored.icalUid,
        stored.sequence + 1,
        "ACCEPTED",
      ),
    ).rejects.toThrow(/older version|dates have changed/);
    // "Maybe" (PARTSTAT=TENTATIVE) is recorded and told, and the booking still waits (issue 16).
    await sendReply(
      demoAccounts.trade.email,
      booking.id,
      stored.icalUid,
      stored.sequence,
      "TENTATIVE",
    );
    const maybe = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: booking.id,
    });
    expect(maybe.state).toBe("sent");
    const events = await t.db.ds.manager.findBy(BookingEvent, {
      bookingId: booking.id,
      channel: "calendar-reply",
    });
    expect(events.map((e) => e.note)).toEqual([
      "Maybe, from their calendar app",
    ]);
    await mailTo(demoAccounts.owner.email, (m) =>
      m.subject.startsWith(
        'Ashby Plaster & Coving answered "maybe" for Template coving',
      ),
    );
    await sendReply(
      demoAccounts.trade.email,
      booking.id,
      stored.icalUid,
      stored.sequence,
      "ACCEPTED",
    );
    const after = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: booking.id,
    });
    expect(after.state).toBe("confirmed");
    expect(after.sequence).toBe(stored.sequence); // RFC 5546 §2.1.4: never bumped by a reply
  });

  it("takes a calendar app's 'Propose new time' (iTIP COUNTER, RFC 5546 §3.2.7) as a proposal", async () => {
    const { booking, stored } = await sentTemplate("Booking: calendar counter");
    const other = weekdaysFrom(stored.start.slice(0, 10), 3);
    await sendReply(
      demoAccounts.trade.email,
      booking.id,
      stored.icalUid,
      stored.sequence,
      "TENTATIVE",
      other,
    );
    const after = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: booking.id,
    });
    expect(after.state).toBe("date-proposed");
    expect(after.proposedStart?.slice(0, 10)).toBe(other);
    // The workshop hears of it as of a proposal by link, with the days.
    await mailTo(demoAccounts.owner.email, (m) =>
      m.subject.startsWith(`Ashby Plaster & Coving proposes `),
    );
  });
});

describe("scenario 4: a slip moves booked trades, who must re-confirm", () => {
  it("moving Hang doors re-books the electrician's second fix (same UID, higher SEQUENCE) and the old link can no longer confirm", async () => {
    const { jobId, p } = await readyJob("Booking: slip");
    const electrician = await trade("Brightwire Electrical");
    const second = taskNamed(p, "Electrician second fix");
    const options = (
      await owner.agent.get(
        `/api/jobs/${jobId}/tasks/${second.id}/booking-options`,
      )
    ).body;
    const booking = (
      await owner.agent
        .post(`/api/jobs/${jobId}/bookings`)
        .set("X-CSRF-Token", owner.csrf)
        .send({
          taskId: second.id,
          tradeId: electrician.id,
          start: options.trades[0].firstFree.start,
          arrivalWindow: "afternoon",
        })
        .expect(201)
    ).body;
    const oldUrl: string = (
      await owner.agent.get(`/api/bookings/${booking.id}/link`)
    ).body.url;
    const stored = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: booking.id,
    });
    await owner.agent
      .post(`/api/bookings/${booking.id}/answer`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ answer: "confirm", channel: "text" })
      .expect(200);

    // Sprayed doors arrive late: Hang doors waits three weeks.
    const now = await programme(jobId);
    const doors = taskNamed(now, "Hang doors");
    const early = now.result.tasks
      .find((x) => x.id === doors.id)!
      .earlyStart.slice(0, 10);
    const late = new Date(`${early}T12:00:00Z`);
    late.setUTCDate(late.getUTCDate() + 21);
    const to = late.toISOString().slice(0, 10);
    const preview = (
      await owner.agent
        .post(`/api/jobs/${jobId}/programme/preview`)
        .set("X-CSRF-Token", owner.csrf)
        .send({
          version: now.version,
          changes: [{ taskId: doors.id, notEarlierThan: to }],
        })
        .expect(200)
    ).body;
    expect(
      preview.impact.reconfirm.map((r: { task: string }) => r.task),
    ).toEqual([second.id]);
    await owner.agent
      .post(`/api/jobs/${jobId}/programme/apply`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        version: now.version,
        changes: [{ taskId: doors.id, notEarlierThan: to }],
      })
      .expect(200);

    const moved = await t.db.ds.manager.findOneByOrFail(Booking, {
      id: booking.id,
    });
    expect(moved.state).toBe("needs-reconfirming");
    expect(moved.sequence).toBe(stored.sequence + 1);
    expect(moved.icalUid).toBe(stored.icalUid);
    expect(moved.start >= to).toBe(true);
    const mail = await mailTo(electrician.email, (m) =>
      m.subject.includes("new dates"),
    );
    const { event } = eventOf(mail);
    expect(event.getFirstPropertyValue("uid")).toBe(stored.icalUid);
    expect(event.getFirstPropertyValue("sequence")).toBe(stored.sequence + 1);
    // The old link shows the new dates and cannot confirm them.
    const oldToken = oldUrl.split("/b/")[1];
    const anon = request.agent(t.sitecue.app);
    const csrf = (await anon.get("/api/auth/session")).body.csrfToken;
    const oldPage = (
      await anon.get(`/api/booking-links/${oldToken}`).expect(200)
    ).body;
    expect(oldPage).toMatchObject({
      status: "dates-changed",
      canAnswer: false,
      start: moved.start,
    });
    const refused = await anon
      .post(`/api/booking-links/${oldToken}/answer`)
      .set("X-CSRF-Token", csrf)
      .send({ answer: "confirm" });
    expect(refused.status).toBe(409);
    // The fresh link in the new e-mail works.
    const freshToken = mail.links
      .find((l) => l.includes("/b/"))!
      .split("/b/")[1];
    expect(
      (
        await anon
          .post(`/api/booking-links/${freshToken}/answer`)
          .set("X-CSRF-Token", csrf)
          .send({ answer: "confirm" })
          .expect(200)
      ).body.state,
    ).toBe("confirmed");
  });
});

describe("scenario 6: a double booking", () => {
  it("flags the decorator's day on another job with their next free start, and books anyway only with a reason", async () => {
    const { jobId, p } = await readyJob("Booking: double booking");
    const decorator = await trade("Kestrel Decorating");
    const demoPaint = await t.db.ds.manager.findOneByOrFail(Booking, {
      tradeId: decorator.id,
      jobId: alcoves.id,
    });
    const paint = taskNamed(p, "Fill, caulk & paint");
    const clash = await owner.agent
      .post(`/api/jobs/${jobId}/bookings`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        taskId: paint.id,
        tradeId: decorator.id,
        start: demoPaint.start,
        arrivalWindow: "all-day",
      });
    expect(clash.status).toBe(409);
    expect(clash.body.error.message).toMatch(
      /Kestrel Decorating is already booked/,
    );
    expect(clash.body.error.message).toMatch(new RegExp(demoJobTitles.alcoves));
    expect(clash.body.error.fields.nextFreeStart[0] > demoPaint.start).toBe(
      true,
    );
    const anyway = await owner.agent
      .post(`/api/jobs/${jobId}/bookings`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        taskId: paint.id,
        tradeId: decorator.id,
        start: demoPaint.start,
        arrivalWindow: "all-day",
        overrideReason: "They bring a second painter",
        send: false,
      });
    expect(anyway.status).toBe(201);
    expect(anyway.body.overrideReason).toBe("They bring a second painter");
  });
});

describe("cancelling", () => {
  it("sends METHOD:CANCEL with STATUS:CANCELLED and a higher SEQUENCE", async () => {
    const { jobId, p } = await readyJob("Booking: cancel");
    const template = taskNamed(p, "Template coving");
    const options = (
      await owner.agent.get(
        `/api/jobs/${jobId}/tasks/${template.id}/booking-options`,
      )
    ).body;
    const booking = (
      await owner.agent
        .post(`/api/jobs/${jobId}/bookings`)
        .set("X-CSRF-Token", owner.csrf)
        .send({
          taskId: template.id,
          tradeId: ashby(options).tradeId,
          start: ashby(options).firstFree.start,
          arrivalWindow: "morning",
        })
        .expect(201)
    ).body;
    const res = await owner.agent
      .post(`/api/bookings/${booking.id}/cancel`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ reason: "Customer postponed" });
    expect(res.body).toMatchObject({ state: "cancelled", sequence: 1 });
    const mail = await mailTo(
      demoAccounts.trade.email,
      (m) =>
        m.subject.includes("is cancelled") && m.subject.includes("Example Row"),
    );
    const { event, cal, method } = eventOf(mail);
    expect(method?.toUpperCase()).toBe("CANCEL");
    expect(cal.getFirstPropertyValue("method")).toBe("CANCEL");
    expect(event.getFirstPropertyValue("status")).toBe("CANCELLED");
    expect(event.getFirstPropertyValue("sequence")).toBe(1);
  });
});

describe("links for bookings sent before links existed", () => {
  it("copy link issues one for the demo's sent booking, and it opens the confirmation page", async () => {
    const plasterer = await trade("Ashby Plaster & Coving");
    const demo = await t.db.ds.manager.findOneByOrFail(Booking, {
      jobId: alcoves.id,
      tradeId: plasterer.id,
      state: "sent",
    });
    expect(demo.linkTokenHash).toBeNull();
    const first = (
      await owner.agent.get(`/api/bookings/${demo.id}/link`).expect(200)
    ).body.url;
    const again = (
      await owner.agent.get(`/api/bookings/${demo.id}/link`).expect(200)
    ).body.url;
    expect(again).toBe(first); // the same link each time, for pasting into a text
    const page = await request(t.sitecue.app).get(
      `/api/booking-links/${first.split("/b/")[1]}`,
    );
    expect(page.status).toBe(200);
    expect(page.body.taskName).toBe("Template coving");
  });
});

describe("a trade who works for two workshops", () => {
  it("is busy here on a day booked by another workshop, shown only as busy", async () => {
    const m = t.db.ds.manager;
    const {
      buildWorkshop,
      buildTrade,
      buildCustomer,
      buildJob,
      buildTask,
      buildBooking,
      linkTradeUser,
    } = await import("../../../tests/factories/builders");
    const { User } = await import("../users/users.entity");
    const dev = await m.findOneByOrFail(User, {
      email: demoAccounts.trade.email,
    });
    const other = await buildWorkshop(m, { name: "Other Joinery" });
    const theirRecord = await buildTrade(m, other, {
      kind: "plasterer",
      businessName: "Ashby Plaster & Coving",
      email: demoAccounts.trade.email,
    });
    await linkTradeUser(m, theirRecord, dev);
    const theirJob = await buildJob(m, other, await buildCustomer(m, other), {
      title: "A secret job elsewhere",
    });
    const theirTask = await buildTask(m, theirJob, {
      name: "Run cornice",
      party: "plasterer",
      durationDays: 1,
    });

    const { jobId, p } = await readyJob("Booking: two workshops");
    const template = taskNamed(p, "Template coving");
    const before = ashby(
      (
        await owner.agent.get(
          `/api/jobs/${jobId}/tasks/${template.id}/booking-options`,
        )
      ).body,
    ).firstFree.start;
    // The other workshop books the plasterer for that whole day.
    await buildBooking(m, theirTask, theirRecord, {
      state: "confirmed",
      start: `${before.slice(0, 10)}T08:00`,
      finish: `${before.slice(0, 10)}T16:30`,
    });
    const after = ashby(
      (
        await owner.agent.get(
          `/api/jobs/${jobId}/tasks/${template.id}/booking-options`,
        )
      ).body,
    ).firstFree.start;
    expect(after.slice(0, 10) > before.slice(0, 10)).toBe(true);
    const clash = await owner.agent
      .post(`/api/jobs/${jobId}/bookings`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        taskId: template.id,
        tradeId: ashby(
          (
            await owner.agent.get(
              `/api/jobs/${jobId}/tasks/${template.id}/booking-options`,
            )
          ).body,
        ).tradeId,
        start: before,
        arrivalWindow: "morning",
      });
    expect(clash.status).toBe(409);
    expect(clash.body.error.message).toMatch(/busy for another workshop/);
    expect(clash.body.error.message).not.toMatch(/secret job/);
    // The workshop's view of the plasterer's time: its own bookings by name, the other's as busy.
    // Two records now share the name: take this workshop's.
    const ashbyHere = await m.findOneByOrFail(Trade, {
      businessName: "Ashby Plaster & Coving",
      workshopId: alcoves.workshopId,
    });
    const day = before.slice(0, 10);
    const busy = (
      await owner.agent
        .get(`/api/trades/${ashbyHere.id}/busy?from=${day}&to=${day}`)
        .expect(200)
    ).body.busy;
    expect(busy).toContainEqual({
      start: `${day}T08:00`,
      finish: `${day}T16:30`,
      label: "Busy (another workshop)",
      ownWorkshop: false,
    });
    expect(JSON.stringify(busy)).not.toMatch(/secret job|Run cornice/);
    const wide = (
      await owner.agent
        .get(`/api/trades/${ashbyHere.id}/busy?from=2026-01-01&to=2027-12-31`)
        .expect(200)
    ).body.busy;
    expect(
      wide.some(
        (b: { label: string; ownWorkshop: boolean }) =>
          b.ownWorkshop &&
          b.label === `Template coving — ${demoJobTitles.alcoves}`,
      ),
    ).toBe(true);
    const backwards = await owner.agent.get(
      `/api/trades/${ashbyHere.id}/busy?from=2027-01-02&to=2027-01-01`,
    );
    expect(backwards.status).toBe(400);
  });
});
