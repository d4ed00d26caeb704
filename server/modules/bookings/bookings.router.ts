import { z } from "zod";
import { limitRequests, type LimitStore } from "../../http/rate-limit";
import {
  bookingOptionsResponseSchema,
  bookingResponseSchema,
  cancelBookingBodySchema,
  createBookingBodySchema,
  idSchema,
  linkAnswerBodySchema,
  linkPageResponseSchema,
  linkTokenParamsSchema,
  proposalDecisionBodySchema,
  recordAnswerBodySchema,
  updateBookingBodySchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import { answerByLink, linkPage } from "./booking-link.service";
import {
  bookingOptions,
  cancelBooking,
  chaseBooking,
  copyLink,
  createBooking,
  decideProposal,
  listJobBookings,
  listUnanswered,
  recordAnswer,
  sendBooking,
  updateDraftBooking,
  type BookingDeps,
} from "./bookings.service";

const job = z.object({ jobId: idSchema });
const booking = z.object({ bookingId: idSchema });
const tag = "bookings";

export function registerBookingRoutes(
  api: ApiRoutes,
  deps: BookingDeps,
  opts: { linkLimit: number; limits: LimitStore },
): void {
  // The public link routes carry their own limit: tokens are unguessable, but nobody gets to try.
  const linkLimiter = limitRequests(opts.limits, {
    name: "booking-links",
    windowMs: 15 * 60 * 1000,
    limit: opts.linkLimit,
    message: "Too many tries with booking links.",
  });

  api.add({
    method: "get",
    path: "/jobs/:jobId/bookings",
    tag,
    summary: "The job's bookings with their history",
    params: job,
    response: z.object({ bookings: z.array(bookingResponseSchema) }),
    handler: async ({ actor, params }) => ({
      bookings: await listJobBookings(deps.ds, actor, params.jobId),
    }),
  });
  api.add({
    method: "get",
    path: "/jobs/:jobId/tasks/:taskId/booking-options",
    tag,
    summary:
      "Trades for a task with their first free start, and the start window that keeps handover",
    params: job.extend({ taskId: idSchema }),
    response: bookingOptionsResponseSchema,
    handler: async ({ actor, params }) =>
      bookingOptions(deps.ds, actor, params.jobId, params.taskId),
  });
  api.add({
    method: "post",
    path: "/jobs/:jobId/bookings",
    tag,
    summary:
      "Book a trade for a task (409 on a clash or day off unless a reason is given)",
    params: job,
    body: createBookingBodySchema,
    status: 201,
    response: bookingResponseSchema,
    handler: async ({ actor, params, body }) =>
      createBooking(deps, actor, params.jobId, body),
  });
  api.add({
    method: "patch",
    path: "/bookings/:bookingId",
    tag,
    summary:
      "Change a draft booking: trade, start, arrival window (409 once it is sent)",
    params: booking,
    body: updateBookingBodySchema,
    response: bookingResponseSchema,
    handler: async ({ actor, params, body }) =>
      updateDraftBooking(deps, actor, params.bookingId, body),
  });
  api.add({
    method: "post",
    path: "/bookings/:bookingId/send",
    tag,
    summary:
      "Send a draft booking: e-mail, calendar invitation, confirmation link",
    params: booking,
    response: bookingResponseSchema,
    handler: async ({ actor, params }) =>
      sendBooking(deps, actor, params.bookingId),
  });
  api.add({
    method: "post",
    path: "/bookings/:bookingId/answer",
    tag,
    summary: "Record the trade's answer given by phone or text",
    params: booking,
    body: recordAnswerBodySchema,
    response: bookingResponseSchema,
    handler: async ({ actor, params, body }) =>
      recordAnswer(deps, actor, params.bookingId, body),
  });
  api.add({
    method: "post",
    path: "/bookings/:bookingId/proposal",
    tag,
    summary: "Accept or reject the trade's proposed start",
    params: booking,
    body: proposalDecisionBodySchema,
    response: bookingResponseSchema,
    handler: async ({ actor, params, body }) =>
      decideProposal(deps, actor, params.bookingId, body.accept, body.note),
  });
  api.add({
    method: "post",
    path: "/bookings/:bookingId/cancel",
    tag,
    summary: "Cancel a booking (the trade gets a calendar cancellation)",
    params: booking,
    body: cancelBookingBodySchema,
    response: bookingResponseSchema,
    handler: async ({ actor, params, body }) =>
      cancelBooking(deps, actor, params.bookingId, body.reason),
  });
  api.add({
    method: "post",
    path: "/bookings/:bookingId/chase",
    tag,
    summary: "Send an unanswered invitation again",
    params: booking,
    response: bookingResponseSchema,
    handler: async ({ actor, params }) =>
      chaseBooking(deps, actor, params.bookingId),
  });
  api.add({
    method: "get",
    path: "/bookings/:bookingId/link",
    tag,
    summary: "The confirmation link, to paste into a text message",
    params: booking,
    response: z.object({ url: z.string() }),
    handler: async ({ actor, params }) =>
      copyLink(deps, actor, params.bookingId),
  });
  api.add({
    method: "get",
    path: "/workshops/:workshopId/bookings/unanswered",
    tag,
    summary:
      "Bookings sent and not answered for longer than `hours` (default 48), oldest first, to chase",
    params: z.object({ workshopId: idSchema }),
    query: z.object({
      hours: z.coerce
        .number()
        .int()
        .min(1)
        .max(24 * 60)
        .default(48),
    }),
    response: z.object({ bookings: z.array(bookingResponseSchema) }),
    handler: async ({ actor, params, query }) => ({
      bookings: await listUnanswered(
        deps,
        actor,
        params.workshopId,
        query.hours,
      ),
    }),
  });
  api.add({
    method: "get",
    path: "/booking-links/:token",
    tag,
    summary: "The confirmation page for one booking (no account needed)",
    before: [linkLimiter],
    params: linkTokenParamsSchema,
    response: linkPageResponseSchema,
    handler: async ({ params }) => linkPage(deps.ds, params.token),
  });
  api.add({
    method: "post",
    path: "/booking-links/:token/answer",
    tag,
    summary:
      "Confirm, decline or propose another start by link (no account needed)",
    before: [linkLimiter],
    params: linkTokenParamsSchema,
    body: linkAnswerBodySchema,
    response: linkPageResponseSchema,
    handler: async ({ params, body }) => answerByLink(deps, params.token, body),
  });
}
