import { queryOptions, useQuery } from "@tanstack/react-query";
import type { TimelineResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { timelineKeys } from "./keys";
import { timelinePaths } from "./paths";

/** GET /api/jobs/:jobId/timeline: the visits as the customer sees them. */
export function getTimeline(
  jobId: string,
  signal?: AbortSignal,
): Promise<TimelineResponse> {
  return api.get<TimelineResponse>(timelinePaths.timeline(jobId), signal);
}

export const timelineQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: timelineKeys.job(jobId),
    queryFn: ({ signal }) => getTimeline(jobId, signal),
    // A slip or an answer elsewhere shows up without a reload.
    refetchInterval: 30_000,
  });

export function useTimeline(jobId: string) {
  return useQuery(timelineQueryOptions(jobId));
}
