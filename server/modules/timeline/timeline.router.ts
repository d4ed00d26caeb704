import { z } from "zod";
import type { DataSource } from "typeorm";
import {
  awayClashesResponseSchema,
  idSchema,
  markTimelineSeenBodySchema,
  markTimelineSeenResponseSchema,
  setAwayDatesBodySchema,
  timelineResponseSchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import {
  getAwayClashes,
  getTimeline,
  markTimelineSeen,
  setAwayDates,
} from "./timeline.service";

const jobParams = z.object({ jobId: idSchema });
const tag = "timeline";

export function registerTimelineRoutes(api: ApiRoutes, ds: DataSource): void {
  api.add({
    method: "get",
    path: "/jobs/:jobId/timeline",
    tag,
    summary:
      "The customer's timeline of visits: who, which days, arrival window, what to prepare, what changed since they last looked",
    params: jobParams,
    response: timelineResponseSchema,
    handler: async ({ actor, params }) => getTimeline(ds, actor, params.jobId),
  });
  api.add({
    method: "post",
    path: "/jobs/:jobId/timeline/seen",
    tag,
    summary:
      "Mark the timeline seen (as built from `version`): later changes are highlighted against it",
    params: jobParams,
    body: markTimelineSeenBodySchema,
    response: markTimelineSeenResponseSchema,
    handler: async ({ actor, params, body }) =>
      markTimelineSeen(ds, actor, params.jobId, body.version),
  });
  api.add({
    method: "put",
    path: "/jobs/:jobId/away-dates",
    tag,
    summary:
      "The dates the customer will be away (today to a year ahead): the site is closed for booking then",
    params: jobParams,
    body: setAwayDatesBodySchema,
    response: timelineResponseSchema,
    handler: async ({ actor, params, body }) =>
      setAwayDates(ds, actor, params.jobId, body),
  });
  api.add({
    method: "get",
    path: "/workshops/:workshopId/away-clashes",
    tag,
    summary:
      "Bookings standing on days the job's customer will be away (for the attention list)",
    params: z.object({ workshopId: idSchema }),
    response: awayClashesResponseSchema,
    handler: async ({ actor, params }) => ({
      clashes: await getAwayClashes(ds, actor, params.workshopId),
    }),
  });
}
