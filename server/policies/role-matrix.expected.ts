// The role matrix's expected answers, written by hand from the brief's roles table — never
// derived from the permission module, so the test checks the code against the brief.
//
//   owner     runs the workshop: everything, incl. members, trades, deleting
//   fitter    workshop staff: all jobs, edit programmes, trades and customers; NOT members,
//             workshop settings, deleting jobs or trades
//   tradeOn   a trade with a booking sent on the job: sees that job, nothing of the workshop's admin
//   tradeOff  a trade of the same workshop with no booking on the job: does not see the job
//   customer  the job's householder: sees own job only
//   other     another customer of the same workshop: does not see this job
//   anon      not signed in
//
// 404 = the record is invisible to them; 403 = visible but not theirs to change (see policies).

export const roles = [
  "owner",
  "fitter",
  "tradeOn",
  "tradeOff",
  "customer",
  "other",
  "anon",
] as const;
export type MatrixRole = (typeof roles)[number];
type Row = Record<MatrixRole, number>;

const all = (s: number): Row => ({
  owner: s,
  fitter: s,
  tradeOn: s,
  tradeOff: s,
  customer: s,
  other: s,
  anon: s,
});
const signedIn = (s: number): Row => ({ ...all(s), anon: 401 });
/** Workshop admin: others of the workshop are refused (403), strangers too. */
const ownerOnly = (ok: number): Row => ({
  owner: ok,
  fitter: 403,
  tradeOn: 403,
  tradeOff: 403,
  customer: 403,
  other: 403,
  anon: 401,
});
const staff = (ok: number): Row => ({
  owner: ok,
  fitter: ok,
  tradeOn: 403,
  tradeOff: 403,
  customer: 403,
  other: 403,
  anon: 401,
});

/** On a job: the trade on it and its customer see the job (403); the others do not (404). */
const jobStaff = (ok: number): Row => ({
  owner: ok,
  fitter: ok,
  tradeOn: 403,
  tradeOff: 404,
  customer: 403,
  other: 404,
  anon: 401,
});

/** A trade's own visit: theirs alone; the workshop and the job's customer know of it. */
const ownVisit = (ok: number): Row => ({
  owner: 403,
  fitter: 403,
  tradeOn: ok,
  tradeOff: 404,
  customer: 403,
  other: 404,
  anon: 401,
});

export const expected: Record<string, Row> = {
  "GET /health": all(200),
  "GET /openapi.json": all(200),
  "GET /dev/mail": all(200), // development/test only: the route does not exist in production
  "GET /auth/session": all(200),
  "POST /auth/sign-in": all(401), // with wrong credentials: reachable by anyone, grants nothing
  "POST /auth/sign-out": all(200),
  "POST /auth/password-reset": all(202),
  "GET /auth/tokens/:token": all(404), // an unknown token
  "POST /auth/set-password": all(404), // an unknown token
  "POST /auth/sign-up": all(201), // anyone may create a workshop (a fresh address each time)
  "POST /auth/verify-email": all(404), // an unknown token
  "POST /auth/verify-email/resend": signedIn(409), // everyone in the matrix is verified already
  "POST /auth/accept-invitation": signedIn(404), // an unknown token; signing in comes first

  "GET /jobs": signedIn(200),
  "GET /jobs/:jobId": {
    owner: 200,
    fitter: 200,
    tradeOn: 200,
    tradeOff: 404,
    customer: 200,
    other: 404,
    anon: 401,
  },
  "POST /workshops/:workshopId/jobs": staff(201),
  "PATCH /jobs/:jobId": {
    owner: 200,
    fitter: 200,
    tradeOn: 403,
    tradeOff: 404,
    customer: 403,
    other: 404,
    anon: 401,
  },
  "DELETE /jobs/:jobId": {
    owner: 204,
    fitter: 403,
    tradeOn: 403,
    tradeOff: 404,
    customer: 403,
    other: 404,
    anon: 401,
  },

  // The programme: the workshop plans it; trades and the customer see their parts through the job.
  "GET /jobs/:jobId/programme": jobStaff(200),
  "POST /jobs/:jobId/tasks": jobStaff(201),
  "PATCH /jobs/:jobId/tasks/:taskId": jobStaff(200),
  "DELETE /jobs/:jobId/tasks/:taskId": jobStaff(200),
  "PUT /jobs/:jobId/tasks/order": jobStaff(200),
  "POST /jobs/:jobId/tasks/:taskId/progress": jobStaff(200),
  "POST /jobs/:jobId/links": jobStaff(201),
  "PATCH /jobs/:jobId/links/:linkId": jobStaff(200),
  "DELETE /jobs/:jobId/links/:linkId": jobStaff(200),
  "POST /jobs/:jobId/programme/preview": jobStaff(200),
  "POST /jobs/:jobId/programme/apply": jobStaff(200),

  // Bookings: the workshop books, sends, records answers; the trade answers by its link.
  "GET /jobs/:jobId/bookings": jobStaff(200),
  "GET /jobs/:jobId/tasks/:taskId/booking-options": jobStaff(200),
  "POST /jobs/:jobId/bookings": jobStaff(201),
  // The booking sent here is the job's only one and still a draft, so the trade is not on the job yet.
  "POST /bookings/:bookingId/send": { ...jobStaff(200), tradeOn: 404 },
  // A draft, as for send: the trade is not on that job yet.
  "PATCH /bookings/:bookingId": { ...jobStaff(200), tradeOn: 404 },
  "POST /bookings/:bookingId/answer": jobStaff(200),
  "POST /bookings/:bookingId/proposal": jobStaff(200),
  "POST /bookings/:bookingId/cancel": jobStaff(200),
  "POST /bookings/:bookingId/chase": jobStaff(200),
  "GET /bookings/:bookingId/link": jobStaff(200),
  "GET /workshops/:workshopId/bookings/unanswered": staff(200),
  // The maker's attention list across the workshop's jobs: owners and fitters only.
  "GET /workshops/:workshopId/attention": staff(200),
  // Sending a failed e-mail of the workshop again (the attention list's "Send again").
  "POST /workshops/:workshopId/outbox/:messageId/retry": staff(200),
  // The confirmation link works without an account, for that one booking: whoever holds it.
  "GET /booking-links/:token": all(200),
  "POST /booking-links/:token/answer": all(200),

  "GET /workshops/:workshopId": staff(200),
  "PATCH /workshops/:workshopId": ownerOnly(200),
  "POST /workshops/:workshopId/settings/preview": ownerOnly(200),
  "GET /workshops/:workshopId/members": ownerOnly(200),
  "GET /workshops/:workshopId/invitations": ownerOnly(200),
  "POST /workshops/:workshopId/invitations": ownerOnly(201),

  "GET /workshops/:workshopId/trades": staff(200),
  "POST /workshops/:workshopId/trades": staff(201),
  // Another trade's record: trades and customers cannot see it at all.
  "PATCH /trades/:tradeId": {
    owner: 200,
    fitter: 200,
    tradeOn: 404,
    tradeOff: 404,
    customer: 404,
    other: 404,
    anon: 401,
  },
  "GET /trades/:tradeId/busy": {
    owner: 200,
    fitter: 200,
    tradeOn: 404,
    tradeOff: 404,
    customer: 404,
    other: 404,
    anon: 401,
  },
  "DELETE /trades/:tradeId": {
    owner: 204,
    fitter: 403,
    tradeOn: 404,
    tradeOff: 404,
    customer: 404,
    other: 404,
    anon: 401,
  },

  "GET /workshops/:workshopId/starters": staff(200),
  "PUT /workshops/:workshopId/starters/:starterId": staff(200),
  // Deleting is the owner's (roles table), as for trades and jobs.
  "DELETE /workshops/:workshopId/starters/:starterId": ownerOnly(204),

  "GET /workshops/:workshopId/customers": staff(200),
  "POST /workshops/:workshopId/customers": staff(201),
  // Bringing trades and customers in, and taking them out: the workshop's staff.
  "POST /workshops/:workshopId/trades/import/preview": staff(200),
  "POST /workshops/:workshopId/trades/import": staff(201),
  "GET /workshops/:workshopId/trades.csv": staff(200),
  "POST /workshops/:workshopId/customers/import/preview": staff(200),
  "POST /workshops/:workshopId/customers/import": staff(201),
  "GET /workshops/:workshopId/customers.csv": staff(200),

  // The job thread: whoever sees the job reads it; the request posts to "Trades & workshop", which
  // the customer sees the job but may not use (403). The file is on such a message, so the
  // customer cannot see it at all (404).
  "GET /jobs/:jobId/thread": {
    owner: 200,
    fitter: 200,
    tradeOn: 200,
    tradeOff: 404,
    customer: 200,
    other: 404,
    anon: 401,
  },
  "POST /jobs/:jobId/thread/messages": {
    owner: 201,
    fitter: 201,
    tradeOn: 201,
    tradeOff: 404,
    customer: 403,
    other: 404,
    anon: 401,
  },
  "POST /jobs/:jobId/thread/messages/upload": {
    owner: 201,
    fitter: 201,
    tradeOn: 201,
    tradeOff: 404,
    customer: 403,
    other: 404,
    anon: 401,
  },
  "GET /jobs/:jobId/thread/attachments/:fileId": {
    owner: 200,
    fitter: 200,
    tradeOn: 200,
    tradeOff: 404,
    customer: 404,
    other: 404,
    anon: 401,
  },
  "POST /jobs/:jobId/thread/read": {
    owner: 200,
    fitter: 200,
    tradeOn: 200,
    tradeOff: 404,
    customer: 200,
    other: 404,
    anon: 401,
  },
  // Own unread counts, over the jobs each person sees.
  "GET /thread/unread": signedIn(200),

  // Drawings. The request's drawing is shared with plasterers (the trade on the job is one) and
  // the customer; the upload is a template to the plasterer's own task, which a trade may make.
  "GET /jobs/:jobId/drawings": {
    owner: 200,
    fitter: 200,
    tradeOn: 200,
    tradeOff: 404,
    customer: 200,
    other: 404,
    anon: 401,
  },
  "POST /jobs/:jobId/drawings": {
    owner: 201,
    fitter: 201,
    tradeOn: 201,
    tradeOff: 404,
    customer: 403,
    other: 404,
    anon: 401,
  },
  "GET /drawings/:drawingId": {
    owner: 200,
    fitter: 200,
    tradeOn: 200,
    tradeOff: 404,
    customer: 200,
    other: 404,
    anon: 401,
  },
  // Renaming and re-sharing are the workshop's; deleting the owner's.
  "PATCH /drawings/:drawingId": jobStaff(200),
  "DELETE /drawings/:drawingId": {
    owner: 204,
    fitter: 403,
    tradeOn: 403,
    tradeOff: 404,
    customer: 403,
    other: 404,
    anon: 401,
  },
  // The workshop made this drawing, so only the workshop adds revisions (a trade revises their own).
  "POST /drawings/:drawingId/revisions": jobStaff(201),
  "GET /drawings/:drawingId/revisions/:letter/file": {
    owner: 200,
    fitter: 200,
    tradeOn: 200,
    tradeOff: 404,
    customer: 200,
    other: 404,
    anon: 401,
  },
  "GET /drawings/:drawingId/revisions/:letter/thumbnail": {
    owner: 200,
    fitter: 200,
    tradeOn: 200,
    tradeOff: 404,
    customer: 200,
    other: 404,
    anon: 401,
  },

  // Own data: everyone signed in has their own calendar feed (the brief: a customer subscribes to one).
  "GET /me/feed": signedIn(200),
  "POST /me/feed": signedIn(201),
  "DELETE /me/feed": signedIn(204),
  // The feed URL is the credential, like a confirmation link: whoever holds it gets the calendar.
  "GET /feeds/:token": all(200),
  "GET /me/days-off": signedIn(200),
  // A trade enters days off once for every workshop; nobody else has trade days off to enter.
  "PUT /me/days-off": {
    owner: 403,
    fitter: 403,
    tradeOn: 200,
    tradeOff: 200,
    customer: 403,
    other: 403,
    anon: 401,
  },

  // A trade's own visits. Anyone signed in lists their own (none unless they speak for a trade).
  // The request's booking is the job's plasterer's (tradeOn), confirmed: only they read it as a
  // visit and act on it. The workshop and the job's customer know the booking (403); another
  // trade — even one on the same job — and other customers do not (404).
  "GET /me/visits": signedIn(200),
  "GET /visits/:bookingId": ownVisit(200),
  "POST /visits/:bookingId/answer": ownVisit(200),
  "POST /visits/:bookingId/progress": ownVisit(200),
  "POST /visits/:bookingId/running-late": ownVisit(200),
  "POST /visits/:bookingId/extend/preview": ownVisit(200),
  "POST /visits/:bookingId/extend": ownVisit(200),

  // The customer's timeline of visits and the dates they will be away: the customer of the job
  // and the workshop (who may look at what the customer sees, and enter dates given by phone);
  // a trade on the job sees the job but not the customer's page (403).
  "GET /jobs/:jobId/timeline": {
    owner: 200,
    fitter: 200,
    tradeOn: 403,
    tradeOff: 404,
    customer: 200,
    other: 404,
    anon: 401,
  },
  "POST /jobs/:jobId/timeline/seen": {
    owner: 200,
    fitter: 200,
    tradeOn: 403,
    tradeOff: 404,
    customer: 200,
    other: 404,
    anon: 401,
  },
  "PUT /jobs/:jobId/away-dates": {
    owner: 200,
    fitter: 200,
    tradeOn: 403,
    tradeOff: 404,
    customer: 200,
    other: 404,
    anon: 401,
  },
  // Bookings on days a customer is away: the workshop's to sort out.
  "GET /workshops/:workshopId/away-clashes": staff(200),

  // The calendar's range request, as its job-page form (scope=job): the workshop's staff; a trade
  // on the job sees the job but not everyone's bookings on it (403); the others do not see it
  // (404). Its other scopes are rows of `expectedVariants` below.
  "GET /calendar": jobStaff(200),
};

/**
 * Routes whose answer depends on a query parameter: one more row for each other form, keyed
 * "METHOD /path?form". The test sends each form's request to every role, as for `expected`.
 */
export const expectedVariants: Record<string, Row> = {
  // The workshop's calendar: its owner and fitter; its trades and customers know the workshop (403).
  "GET /calendar?scope=workshop": staff(200),
  // A trade's own calendar, whoever booked them (tradeOff has a trade record too); the others
  // have no trade calendar to read (403, their own data).
  "GET /calendar?scope=me": {
    owner: 403,
    fitter: 403,
    tradeOn: 200,
    tradeOff: 200,
    customer: 403,
    other: 403,
    anon: 401,
  },
};
