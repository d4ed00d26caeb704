import {
  extendImpactSchema,
  extendResponseSchema,
  extendVisitBodySchema,
  linkAnswerBodySchema,
  myVisitsResponseSchema,
  runningLateBodySchema,
  visitDetailResponseSchema,
  visitParamsSchema,
  visitProgressBodySchema,
  visitSchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import type { BookingDeps } from "../bookings/bookings.service";
import {
  answerVisit,
  extendVisit,
  getVisit,
  markVisitProgress,
  myVisits,
  previewExtend,
  runningLate,
} from "./visits.service";

const tag = "visits";

/** A trade's own visits across every workshop they work for, and what they do on them. */
export function registerVisitRoutes(api: ApiRoutes, deps: BookingDeps): void {
  api.add({
    method: "get",
    path: "/me/visits",
    tag,
    summary:
      "My visits (a trade's bookings) across every workshop I work for: upcoming, then past",
    response: myVisitsResponseSchema,
    handler: async ({ actor }) => myVisits(deps.ds, actor),
  });
  api.add({
    method: "get",
    path: "/visits/:bookingId",
    tag,
    summary:
      "One of my visits, with what its confirmation page shows (the trade who holds it)",
    params: visitParamsSchema,
    response: visitDetailResponseSchema,
    handler: async ({ actor, params }) =>
      getVisit(deps.ds, actor, params.bookingId),
  });
  api.add({
    method: "post",
    path: "/visits/:bookingId/answer",
    tag,
    summary: "Confirm, decline or propose another start, signed in",
    params: visitParamsSchema,
    body: linkAnswerBodySchema,
    response: visitDetailResponseSchema,
    handler: async ({ actor, params, body }) =>
      answerVisit(deps, actor, params.bookingId, body),
  });
  api.add({
    method: "post",
    path: "/visits/:bookingId/progress",
    tag,
    summary: "Mark my task started or done (now, in the job's time zone)",
    params: visitParamsSchema,
    body: visitProgressBodySchema,
    response: visitSchema,
    handler: async ({ actor, params, body }) =>
      markVisitProgress(deps, actor, params.bookingId, body),
  });
  api.add({
    method: "post",
    path: "/visits/:bookingId/running-late",
    tag,
    summary:
      "Tell the workshop I am running late, with my new arrival time (thread note and e-mail)",
    params: visitParamsSchema,
    body: runningLateBodySchema,
    response: visitSchema,
    handler: async ({ actor, params, body }) =>
      runningLate(deps, actor, params.bookingId, body),
  });
  api.add({
    method: "post",
    path: "/visits/:bookingId/extend/preview",
    tag,
    summary:
      "The knock-on of my task taking one more working day, without saving",
    params: visitParamsSchema,
    response: extendImpactSchema,
    handler: async ({ actor, params }) =>
      previewExtend(deps, actor, params.bookingId),
  });
  api.add({
    method: "post",
    path: "/visits/:bookingId/extend",
    tag,
    summary:
      "My task takes one more working day: applied through the programme, moved bookings re-confirmed",
    params: visitParamsSchema,
    body: extendVisitBodySchema,
    response: extendResponseSchema,
    handler: async ({ actor, params, body }) =>
      extendVisit(deps, actor, params.bookingId, body),
  });
}
