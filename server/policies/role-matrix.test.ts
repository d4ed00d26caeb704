import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  anonymous,
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../tests/setup/test-app";
import {
  buildBooking,
  buildFailedMail,
  buildJob,
  buildLink,
  buildTask,
  buildTrade,
  buildUser,
  linkTradeUser,
} from "../../tests/factories/builders";
import {
  demoAccounts,
  demoJobTitles,
  DEMO_WORKSHOP_NAME,
} from "../../tests/factories/demo-scenario";
import { Customer } from "../modules/customers/customers.entity";
import { Job } from "../modules/jobs/jobs.entity";
import { Trade } from "../modules/trades/trades.entity";
import { Booking } from "../modules/bookings/bookings.entity";
import { Task } from "../modules/programme/programme.entity";
import { Workshop } from "../modules/workshops/workshops.entity";
import { ProgrammeStarter } from "../modules/starters/starters.entity";
import { issueFeed } from "../modules/feeds/feeds.service";
import { User } from "../modules/users/users.entity";
import { samplePng } from "../../tests/setup/uploads";
import { newId } from "../db/columns";
import {
  expected,
  expectedVariants,
  roles,
  type MatrixRole,
} from "./role-matrix.expected";

let t: TestApp;
let ids: {
  workshopId: string;
  jobId: string;
  decoratorId: string;
  rosaId: string;
  plastererId: string;
};
const emails: Record<Exclude<MatrixRole, "anon">, string> = {
  owner: demoAccounts.owner.email,
  fitter: demoAccounts.fitter.email,
  tradeOn: demoAccounts.trade.email,
  tradeOff: "ola@tarnfloors.example.test",
  customer: demoAccounts.customer.email,
  other: "tom.fennimore@example.test",
};

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  const m = t.db.ds.manager;
  const workshop = await m.findOneByOrFail(Workshop, {
    name: DEMO_WORKSHOP_NAME,
  });
  const job = await m.findOneByOrFail(Job, { title: demoJobTitles.alcoves });
  const decorator = await m.findOneByOrFail(Trade, {
    businessName: "Kestrel Decorating",
  });
  const plasterer = await m.findOneByOrFail(Trade, {
    businessName: "Ashby Plaster & Coving",
  });
  const flooring = await m.findOneByOrFail(Trade, {
    businessName: "Tarn Floors",
  });
  const rosa = await m.findOneByOrFail(Customer, {
    email: demoAccounts.customer.email,
  });
  const tom = await m.findOneByOrFail(Customer, { email: emails.other });
  // Accounts for the two "not on this job" people.
  const ola = await buildUser(m, { email: emails.tradeOff, name: "Ola Tarn" });
  await linkTradeUser(m, flooring, ola);
  const tomUser = await buildUser(m, {
    email: emails.other,
    name: "Tom Fennimore",
  });
  await m.update(Customer, { id: tom.id }, { userId: tomUser.id });
  ids = {
    workshopId: workshop.id,
    jobId: job.id,
    decoratorId: decorator.id,
    rosaId: rosa.id,
    plastererId: plasterer.id,
  };
}, 120_000);

afterAll(async () => {
  await t?.close();
});

/** A job like the demo's: Rosa's, with the demo plasterer's booking sent — so each role relates to it the same way. */
async function freshJob(): Promise<string> {
  return (await freshProgramme()).jobId;
}

async function freshProgramme(): Promise<{
  jobId: string;
  taskId: string;
  otherTaskId: string;
  thirdTaskId: string;
  covingTaskId: string;
  bookingId: string;
  linkId: string;
}> {
  const m = t.db.ds.manager;
  const workshop = await m.findOneByOrFail(Workshop, { id: ids.workshopId });
  const rosa = await m.findOneByOrFail(Customer, { id: ids.rosaId });
  const plasterer = await m.findOneByOrFail(Trade, { id: ids.plastererId });
  const job = await buildJob(m, workshop, rosa, { title: "Matrix job" });
  const fix = await buildTask(m, job, {
    name: "Fix carcasses & scribes",
    party: "workshop",
    durationDays: 2,
  });
  const task = await buildTask(m, job, {
    name: "Template coving",
    party: "plasterer",
    durationDays: 0.5,
  });
  const link = await buildLink(m, fix, task);
  const doors = await buildTask(m, job, {
    name: "Hang doors",
    party: "workshop",
    durationDays: 1,
  });
  const coving = await buildTask(m, job, {
    name: "Fit coving & make good",
    party: "plasterer",
    durationDays: 1,
  });
  await buildLink(m, task, coving, { lag: 2 });
  const booking = await buildBooking(m, task, plasterer, {
    state: "sent",
    start: "2027-02-01T08:00",
    finish: "2027-02-01T12:00",
  });
  return {
    jobId: job.id,
    taskId: task.id,
    otherTaskId: fix.id,
    thirdTaskId: doors.id,
    covingTaskId: coving.id,
    bookingId: booking.id,
    linkId: link.id,
  };
}

/** A fresh job's booking in a given state (drafts are turned into sent bookings through the API when a link is needed). */
async function bookingIn(
  state: "draft" | "sent" | "date-proposed",
): Promise<string> {
  const p = await freshProgramme();
  const m = t.db.ds.manager;
  await m.update(
    Booking,
    { id: p.bookingId },
    {
      state,
      proposedStart: state === "date-proposed" ? "2027-02-02T08:00" : null,
      // Every fresh job books the plasterer on the same morning, so a draft is one "booked
      // despite a clash": sending it re-checks the slot and needs the reason (issue 13, item 3).
      overrideReason:
        state === "draft"
          ? "The matrix books every job the same morning"
          : null,
    },
  );
  return p.bookingId;
}

/**
 * A fresh job's plasterer booking, confirmed (a trade acts only on a confirmed visit); `clear`
 * also marks the task it waits for done, so it is clear to start.
 */
async function confirmedVisit(clear = false): Promise<string> {
  const p = await freshProgramme();
  const m = t.db.ds.manager;
  await m.update(Booking, { id: p.bookingId }, { state: "confirmed" });
  if (clear)
    await m.update(
      Task,
      { id: p.otherTaskId },
      { actualStart: "2025-06-02", actualFinish: "2025-06-03" },
    );
  return p.bookingId;
}

/** A booking sent through the API as the owner, and its confirmation link's token. */
async function linkedBooking(): Promise<{ bookingId: string; token: string }> {
  const bookingId = await bookingIn("draft");
  const owner = await signIn(t, emails.owner);
  await owner.agent
    .post(`/api/bookings/${bookingId}/send`)
    .set("X-CSRF-Token", owner.csrf)
    .expect(200);
  const link = await owner.agent
    .get(`/api/bookings/${bookingId}/link`)
    .expect(200);
  return { bookingId, token: link.body.url.split("/b/")[1] };
}

const unique = () => randomBytes(4).toString("hex");

/** A fresh job with a site photo on a "Trades & workshop" thread message (posted by the owner). */
async function threadAttachment(): Promise<{ jobId: string; fileId: string }> {
  const jobId = await freshJob();
  const owner = await signIn(t, emails.owner);
  const res = await owner.agent
    .post(`/api/jobs/${jobId}/thread/messages/upload`)
    .set("X-CSRF-Token", owner.csrf)
    .field("audience", "trades")
    .attach("file", await samplePng(40, 30), "site.png")
    .expect(201);
  return { jobId, fileId: res.body.attachments[0].id };
}

/** A fresh job with a drawing (a PNG, Rev A) the owner shared with plasterers and the customer, for the plasterer's task. */
async function freshDrawing(): Promise<{
  jobId: string;
  taskId: string;
  drawingId: string;
}> {
  const p = await freshProgramme();
  const owner = await signIn(t, emails.owner);
  const res = await owner.agent
    .post(`/api/jobs/${p.jobId}/drawings`)
    .set("X-CSRF-Token", owner.csrf)
    .field("title", "Elevation")
    .field("kind", "drawing")
    .field("taskIds", p.taskId)
    .field("shareTradeKinds", "plasterer")
    .field("shareWithCustomer", "true")
    .attach("file", await samplePng(40, 30), "elevation.png")
    .expect(201);
  return { jobId: p.jobId, taskId: p.taskId, drawingId: res.body.id };
}

/** One concrete request per route: path, and a valid body for changes. */
const requests: Record<
  string,
  () => Promise<{
    path: string;
    body?: object;
    /** A multipart body instead: text fields and `file` parts. */
    multipart?: {
      fields: Record<string, string>;
      files: { name: string; body: Buffer }[];
    };
  }>
> = {
  "GET /health": async () => ({ path: "/api/health" }),
  "GET /openapi.json": async () => ({ path: "/api/openapi.json" }),
  "GET /dev/mail": async () => ({ path: "/api/dev/mail" }),
  "GET /auth/session": async () => ({ path: "/api/auth/session" }),
  "POST /auth/sign-in": async () => ({
    path: "/api/auth/sign-in",
    body: { email: "nobody@example.test", password: "wrong-password" },
  }),
  "POST /auth/sign-out": async () => ({ path: "/api/auth/sign-out" }),
  "POST /auth/password-reset": async () => ({
    path: "/api/auth/password-reset",
    body: { email: "nobody@example.test" },
  }),
  "GET /auth/tokens/:token": async () => ({
    path: `/api/auth/tokens/${randomBytes(32).toString("base64url")}`,
  }),
  "POST /auth/set-password": async () => ({
    path: "/api/auth/set-password",
    body: {
      token: randomBytes(32).toString("base64url"),
      password: "a-long-enough-password",
    },
  }),
  "POST /auth/sign-up": async () => ({
    path: "/api/auth/sign-up",
    body: {
      workshopName: "Matrix Joinery",
      name: "Matrix Owner",
      email: `signup-${randomBytes(6).toString("hex")}@example.test`,
      password: "matrix-sign-up-password",
    },
  }),
  "POST /auth/verify-email": async () => ({
    path: "/api/auth/verify-email",
    body: { token: randomBytes(32).toString("base64url") },
  }),
  "POST /auth/verify-email/resend": async () => ({
    path: "/api/auth/verify-email/resend",
  }),
  "POST /auth/accept-invitation": async () => ({
    path: "/api/auth/accept-invitation",
    body: { token: randomBytes(32).toString("base64url") },
  }),
  "GET /jobs": async () => ({ path: "/api/jobs" }),
  "GET /jobs/:jobId": async () => ({ path: `/api/jobs/${ids.jobId}` }),
  "POST /workshops/:workshopId/jobs": async () => ({
    path: `/api/workshops/${ids.workshopId}/jobs`,
    body: {
      title: "New alcove pair",
      customerId: ids.rosaId,
      siteAddress: "2 Example Row, Wetherfold",
      postcode: "QX1 2AB",
      area: "Wetherfold",
      holidayRegion: "GB-ENG",
    },
  }),
  "PATCH /jobs/:jobId": async () => ({
    path: `/api/jobs/${await freshJob()}`,
    body: { version: 1, title: "Renamed" },
  }),
  "DELETE /jobs/:jobId": async () => ({
    path: `/api/jobs/${await freshJob()}`,
  }),
  "GET /jobs/:jobId/programme": async () => ({
    path: `/api/jobs/${await freshJob()}/programme`,
  }),
  "POST /jobs/:jobId/tasks": async () => ({
    path: `/api/jobs/${await freshJob()}/tasks`,
    body: {
      version: 1,
      name: "Fit plinths",
      party: "workshop",
      durationDays: 0.5,
    },
  }),
  "PATCH /jobs/:jobId/tasks/:taskId": async () => {
    const p = await freshProgramme();
    return {
      path: `/api/jobs/${p.jobId}/tasks/${p.taskId}`,
      body: { version: 1, durationDays: 1 },
    };
  },
  "DELETE /jobs/:jobId/tasks/:taskId": async () => {
    const p = await freshProgramme();
    return { path: `/api/jobs/${p.jobId}/tasks/${p.otherTaskId}?version=1` };
  },
  "PUT /jobs/:jobId/tasks/order": async () => {
    const p = await freshProgramme();
    return {
      path: `/api/jobs/${p.jobId}/tasks/order`,
      body: {
        version: 1,
        taskIds: [p.thirdTaskId, p.covingTaskId, p.taskId, p.otherTaskId],
      },
    };
  },
  "POST /jobs/:jobId/tasks/:taskId/progress": async () => {
    const p = await freshProgramme();
    return {
      path: `/api/jobs/${p.jobId}/tasks/${p.otherTaskId}/progress`,
      body: { version: 1, actualStart: "2027-01-25", actualFinish: null },
    };
  },
  "POST /jobs/:jobId/links": async () => {
    const p = await freshProgramme();
    return {
      path: `/api/jobs/${p.jobId}/links`,
      body: {
        version: 1,
        fromTaskId: p.otherTaskId,
        toTaskId: p.thirdTaskId,
        kind: "FS",
        lag: 0,
      },
    };
  },
  "PATCH /jobs/:jobId/links/:linkId": async () => {
    const p = await freshProgramme();
    return {
      path: `/api/jobs/${p.jobId}/links/${p.linkId}`,
      body: { version: 1, lag: 1 },
    };
  },
  "DELETE /jobs/:jobId/links/:linkId": async () => {
    const p = await freshProgramme();
    return { path: `/api/jobs/${p.jobId}/links/${p.linkId}?version=1` };
  },
  "POST /jobs/:jobId/programme/preview": async () => {
    const p = await freshProgramme();
    return {
      path: `/api/jobs/${p.jobId}/programme/preview`,
      body: {
        version: 1,
        changes: [{ taskId: p.otherTaskId, notEarlierThan: "2027-02-03" }],
      },
    };
  },
  "POST /jobs/:jobId/programme/apply": async () => {
    const p = await freshProgramme();
    return {
      path: `/api/jobs/${p.jobId}/programme/apply`,
      body: {
        version: 1,
        changes: [{ taskId: p.otherTaskId, notEarlierThan: "2027-02-03" }],
      },
    };
  },
  "GET /jobs/:jobId/bookings": async () => ({
    path: `/api/jobs/${await freshJob()}/bookings`,
  }),
  "GET /jobs/:jobId/tasks/:taskId/booking-options": async () => {
    const p = await freshProgramme();
    return {
      path: `/api/jobs/${p.jobId}/tasks/${p.covingTaskId}/booking-options`,
    };
  },
  "POST /jobs/:jobId/bookings": async () => {
    const p = await freshProgramme();
    return {
      path: `/api/jobs/${p.jobId}/bookings`,
      body: {
        taskId: p.covingTaskId,
        tradeId: ids.plastererId,
        start: "2027-02-08",
        arrivalWindow: "all-day",
        send: false,
      },
    };
  },
  "POST /bookings/:bookingId/send": async () => ({
    path: `/api/bookings/${await bookingIn("draft")}/send`,
  }),
  "PATCH /bookings/:bookingId": async () => ({
    path: `/api/bookings/${await bookingIn("draft")}`,
    body: { arrivalWindow: "all-day" },
  }),
  "POST /bookings/:bookingId/answer": async () => ({
    path: `/api/bookings/${await bookingIn("sent")}/answer`,
    body: {
      answer: "confirm",
      channel: "phone",
      note: "Said yes on the phone",
    },
  }),
  "POST /bookings/:bookingId/proposal": async () => ({
    path: `/api/bookings/${await bookingIn("date-proposed")}/proposal`,
    body: { accept: false, note: "That day is taken" },
  }),
  "POST /bookings/:bookingId/cancel": async () => ({
    path: `/api/bookings/${await bookingIn("sent")}/cancel`,
    body: { reason: "Customer postponed" },
  }),
  "POST /bookings/:bookingId/chase": async () => ({
    path: `/api/bookings/${await bookingIn("sent")}/chase`,
  }),
  "GET /bookings/:bookingId/link": async () => ({
    path: `/api/bookings/${(await linkedBooking()).bookingId}/link`,
  }),
  "GET /workshops/:workshopId/bookings/unanswered": async () => ({
    path: `/api/workshops/${ids.workshopId}/bookings/unanswered?hours=1`,
  }),
  "GET /workshops/:workshopId/attention": async () => ({
    path: `/api/workshops/${ids.workshopId}/attention`,
  }),
  // A fresh failed e-mail of the demo workshop per role, so each request finds one to send again.
  "POST /workshops/:workshopId/outbox/:messageId/retry": async () => ({
    path: `/api/workshops/${ids.workshopId}/outbox/${(await buildFailedMail(t.db.ds.manager, ids.workshopId)).id}/retry`,
  }),
  "GET /booking-links/:token": async () => ({
    path: `/api/booking-links/${(await linkedBooking()).token}`,
  }),
  "POST /booking-links/:token/answer": async () => ({
    path: `/api/booking-links/${(await linkedBooking()).token}/answer`,
    body: { answer: "confirm" },
  }),
  "GET /workshops/:workshopId": async () => ({
    path: `/api/workshops/${ids.workshopId}`,
  }),
  "PATCH /workshops/:workshopId": async () => ({
    path: `/api/workshops/${ids.workshopId}`,
    body: { town: "Wetherfold" },
  }),
  "POST /workshops/:workshopId/settings/preview": async () => ({
    path: `/api/workshops/${ids.workshopId}/settings/preview`,
    body: { workingWeekdays: [1, 2, 3, 4] },
  }),
  "GET /workshops/:workshopId/members": async () => ({
    path: `/api/workshops/${ids.workshopId}/members`,
  }),
  "GET /workshops/:workshopId/invitations": async () => ({
    path: `/api/workshops/${ids.workshopId}/invitations`,
  }),
  "POST /workshops/:workshopId/invitations": async () => ({
    path: `/api/workshops/${ids.workshopId}/invitations`,
    body: {
      role: "fitter",
      name: "New Fitter",
      email: `fitter-${unique()}@example.test`,
    },
  }),
  "GET /workshops/:workshopId/trades": async () => ({
    path: `/api/workshops/${ids.workshopId}/trades`,
  }),
  "POST /workshops/:workshopId/trades": async () => ({
    path: `/api/workshops/${ids.workshopId}/trades`,
    body: {
      businessName: `Trade ${unique()}`,
      kind: "plumber",
      contactName: "A Plumber",
      email: `plumber-${unique()}@example.test`,
      phone: "01632 960 999",
    },
  }),
  "PATCH /trades/:tradeId": async () => ({
    path: `/api/trades/${ids.decoratorId}`,
    body: { phone: "01632 960 272" },
  }),
  "GET /trades/:tradeId/busy": async () => ({
    path: `/api/trades/${ids.decoratorId}/busy?from=2026-01-01&to=2027-12-31`,
  }),
  "DELETE /trades/:tradeId": async () => {
    const workshop = await t.db.ds.manager.findOneByOrFail(Workshop, {
      id: ids.workshopId,
    });
    const trade = await buildTrade(t.db.ds.manager, workshop, {
      kind: "other",
    });
    return { path: `/api/trades/${trade.id}` };
  },
  "GET /workshops/:workshopId/starters": async () => ({
    path: `/api/workshops/${ids.workshopId}/starters`,
  }),
  "PUT /workshops/:workshopId/starters/:starterId": async () => {
    const starter = await t.db.ds.manager.findOneByOrFail(ProgrammeStarter, {
      workshopId: ids.workshopId,
      name: "Bookcase wall",
    });
    return {
      path: `/api/workshops/${ids.workshopId}/starters/${starter.id}`,
      body: {
        name: "Bookcase wall",
        tasks: starter.tasks,
        links: starter.links,
      },
    };
  },
  // A fresh starter per role, so each request finds one to delete.
  "DELETE /workshops/:workshopId/starters/:starterId": async () => {
    const m = t.db.ds.manager;
    const id = newId();
    await m.insert(ProgrammeStarter, {
      id,
      workshopId: ids.workshopId,
      name: `Spare starter ${unique()}`,
      description: "",
      tasks: [
        {
          key: "a",
          name: "A",
          party: "workshop",
          durationDays: 1,
          hazards: [],
          customerNote: "",
        },
      ],
      links: [],
    });
    return { path: `/api/workshops/${ids.workshopId}/starters/${id}` };
  },
  "GET /workshops/:workshopId/customers": async () => ({
    path: `/api/workshops/${ids.workshopId}/customers`,
  }),
  "POST /workshops/:workshopId/customers": async () => ({
    path: `/api/workshops/${ids.workshopId}/customers`,
    body: { name: "New Customer", email: `c-${unique()}@example.test` },
  }),
  "POST /workshops/:workshopId/trades/import/preview": async () => ({
    path: `/api/workshops/${ids.workshopId}/trades/import/preview`,
    body: {
      fileName: "trades.csv",
      text: "Business,Name,Email,Phone\r\nA Firm,Al,a@example.test,01632 960 111",
    },
  }),
  "POST /workshops/:workshopId/trades/import": async () => ({
    path: `/api/workshops/${ids.workshopId}/trades/import`,
    body: {
      rows: [
        {
          row: 1,
          businessName: `Trade ${unique()}`,
          contactName: "A Tiler",
          kind: "other",
          email: `tiler-${unique()}@example.test`,
          phone: "01632 960 998",
          addDuplicate: true,
        },
      ],
    },
  }),
  "GET /workshops/:workshopId/trades.csv": async () => ({
    path: `/api/workshops/${ids.workshopId}/trades.csv`,
  }),
  "POST /workshops/:workshopId/customers/import/preview": async () => ({
    path: `/api/workshops/${ids.workshopId}/customers/import/preview`,
    body: {
      fileName: "customers.csv",
      text: "Name,Email\r\nAnn Example,ann@example.test",
    },
  }),
  "POST /workshops/:workshopId/customers/import": async () => ({
    path: `/api/workshops/${ids.workshopId}/customers/import`,
    body: {
      rows: [
        {
          row: 1,
          name: "Imported Customer",
          email: `c-${unique()}@example.test`,
        },
      ],
    },
  }),
  "GET /workshops/:workshopId/customers.csv": async () => ({
    path: `/api/workshops/${ids.workshopId}/customers.csv`,
  }),
  "GET /jobs/:jobId/thread": async () => ({
    path: `/api/jobs/${await freshJob()}/thread`,
  }),
  "POST /jobs/:jobId/thread/messages": async () => ({
    path: `/api/jobs/${await freshJob()}/thread/messages`,
    body: { audience: "trades", text: "Skip arrives at 08:00" },
  }),
  "POST /jobs/:jobId/thread/messages/upload": async () => ({
    path: `/api/jobs/${await freshJob()}/thread/messages/upload`,
    multipart: {
      fields: { audience: "trades", text: "The wall as found" },
      files: [{ name: "wall.png", body: await samplePng(40, 30) }],
    },
  }),
  "GET /jobs/:jobId/thread/attachments/:fileId": async () => {
    const a = await threadAttachment();
    return { path: `/api/jobs/${a.jobId}/thread/attachments/${a.fileId}` };
  },
  "POST /jobs/:jobId/thread/read": async () => ({
    path: `/api/jobs/${await freshJob()}/thread/read`,
    body: {},
  }),
  "GET /thread/unread": async () => ({ path: "/api/thread/unread" }),
  "GET /jobs/:jobId/drawings": async () => ({
    path: `/api/jobs/${(await freshDrawing()).jobId}/drawings`,
  }),
  "POST /jobs/:jobId/drawings": async () => {
    const p = await freshProgramme();
    return {
      path: `/api/jobs/${p.jobId}/drawings`,
      multipart: {
        fields: {
          title: "Coving template",
          kind: "template",
          taskIds: p.taskId,
        },
        files: [{ name: "template.png", body: await samplePng(40, 30) }],
      },
    };
  },
  "GET /drawings/:drawingId": async () => ({
    path: `/api/drawings/${(await freshDrawing()).drawingId}`,
  }),
  "PATCH /drawings/:drawingId": async () => ({
    path: `/api/drawings/${(await freshDrawing()).drawingId}`,
    body: { title: "Elevation, revised title", shareWithCustomer: false },
  }),
  "DELETE /drawings/:drawingId": async () => ({
    path: `/api/drawings/${(await freshDrawing()).drawingId}`,
  }),
  "POST /drawings/:drawingId/revisions": async () => ({
    path: `/api/drawings/${(await freshDrawing()).drawingId}/revisions`,
    multipart: {
      fields: { note: "Left alcove 12 mm narrower" },
      files: [{ name: "elevation-b.png", body: await samplePng(40, 30) }],
    },
  }),
  "GET /drawings/:drawingId/revisions/:letter/file": async () => ({
    path: `/api/drawings/${(await freshDrawing()).drawingId}/revisions/A/file`,
  }),
  "GET /drawings/:drawingId/revisions/:letter/thumbnail": async () => ({
    path: `/api/drawings/${(await freshDrawing()).drawingId}/revisions/A/thumbnail`,
  }),
  "GET /me/feed": async () => ({ path: "/api/me/feed" }),
  "POST /me/feed": async () => ({ path: "/api/me/feed" }),
  "DELETE /me/feed": async () => ({ path: "/api/me/feed" }),
  // A token made here for the customer: the URL works for whoever holds it.
  "GET /feeds/:token": async () => {
    const rosa = await t.db.ds.manager.findOneByOrFail(User, {
      email: emails.customer,
    });
    const { url } = await issueFeed(t.db.ds, "http://localhost", rosa.id);
    return { path: new URL(url).pathname };
  },
  "GET /me/days-off": async () => ({ path: "/api/me/days-off" }),
  // A day far beyond the demo's bookings, so no other row's booking options change.
  "PUT /me/days-off": async () => ({
    path: "/api/me/days-off",
    body: { daysOff: ["2031-01-06"] },
  }),
  "GET /me/visits": async () => ({ path: "/api/me/visits" }),
  "GET /visits/:bookingId": async () => ({
    path: `/api/visits/${await confirmedVisit()}`,
  }),
  "POST /visits/:bookingId/answer": async () => ({
    path: `/api/visits/${await bookingIn("sent")}/answer`,
    body: { answer: "confirm" },
  }),
  "POST /visits/:bookingId/progress": async () => ({
    path: `/api/visits/${await confirmedVisit(true)}/progress`,
    body: { mark: "started" },
  }),
  "POST /visits/:bookingId/running-late": async () => ({
    path: `/api/visits/${await confirmedVisit()}/running-late`,
    body: { arrivalTime: "10:30" },
  }),
  "POST /visits/:bookingId/extend/preview": async () => ({
    path: `/api/visits/${await confirmedVisit()}/extend/preview`,
  }),
  "POST /visits/:bookingId/extend": async () => ({
    path: `/api/visits/${await confirmedVisit()}/extend`,
    body: { version: 1 },
  }),
  "GET /jobs/:jobId/timeline": async () => ({
    path: `/api/jobs/${await freshJob()}/timeline`,
  }),
  "POST /jobs/:jobId/timeline/seen": async () => ({
    path: `/api/jobs/${await freshJob()}/timeline/seen`,
    body: { version: 1 },
  }),
  // A week about 200 days ahead: inside the year the customer may mark.
  "PUT /jobs/:jobId/away-dates": async () => {
    const from = new Date(Date.now() + 200 * 86_400_000);
    const to = new Date(from.getTime() + 6 * 86_400_000);
    return {
      path: `/api/jobs/${await freshJob()}/away-dates`,
      body: {
        ranges: [
          {
            from: from.toISOString().slice(0, 10),
            to: to.toISOString().slice(0, 10),
          },
        ],
      },
    };
  },
  "GET /workshops/:workshopId/away-clashes": async () => ({
    path: `/api/workshops/${ids.workshopId}/away-clashes`,
  }),
  "GET /calendar": async () => ({
    path: `/api/calendar?scope=job&id=${await freshJob()}&from=2027-01-25&to=2027-02-28`,
  }),
};

/** The requests of `expectedVariants`: the other forms of a route. */
const variantRequests: typeof requests = {
  "GET /calendar?scope=workshop": async () => ({
    path: `/api/calendar?scope=workshop&id=${ids.workshopId}&from=2027-01-25&to=2027-02-28`,
  }),
  "GET /calendar?scope=me": async () => ({
    path: "/api/calendar?scope=me&from=2027-01-25&to=2027-02-28",
  }),
};

async function sessionFor(role: MatrixRole): Promise<Session> {
  return role === "anon" ? anonymous(t) : signIn(t, emails[role]);
}

describe("role matrix: every /api route for every role", () => {
  it("has an expected row and a request for every registered route, and no stale rows", () => {
    const registered = t.sitecue.routes.specs
      .map((s) => `${s.method.toUpperCase()} ${s.path}`)
      .sort();
    expect(Object.keys(expected).sort()).toEqual(registered);
    expect(Object.keys(requests).sort()).toEqual(registered);
    // Each variant is a form of a registered route, with its own request.
    for (const key of Object.keys(expectedVariants))
      expect(registered, key).toContain(key.split("?")[0]);
    expect(Object.keys(variantRequests).sort()).toEqual(
      Object.keys(expectedVariants).sort(),
    );
  });

  const rows: (readonly [
    string,
    Record<MatrixRole, number>,
    (typeof requests)[string],
  ])[] = [
    ...Object.entries(expected).map(
      ([route, row]) => [route, row, requests[route]] as const,
    ),
    ...Object.entries(expectedVariants).map(
      ([route, row]) => [route, row, variantRequests[route]] as const,
    ),
  ];
  for (const [route, row, request] of rows) {
    it(route, async () => {
      const [method, path] = route.split(" ");
      const seen: Record<string, number> = {};
      for (const role of roles) {
        const s = await sessionFor(role);
        const req = await request();
        const call = s.agent[
          method.toLowerCase() as "get" | "post" | "patch" | "put" | "delete"
        ](req.path).set("X-CSRF-Token", s.csrf);
        const res = await (req.multipart
          ? req.multipart.files.reduce(
              (c, f) => c.attach("file", f.body, f.name),
              Object.entries(req.multipart.fields).reduce(
                (c, [k, v]) => c.field(k, v),
                call,
              ),
            )
          : req.body
            ? call.send(req.body)
            : call);
        seen[role] = res.status;
        if (res.status >= 400)
          expect(
            res.body.error?.code,
            `${role} ${route} error body`,
          ).toBeTypeOf("string");
      }
      expect(seen, `${method} ${path}`).toEqual(row);
    });
  }
});
