import { queryOptions, useQuery } from "@tanstack/react-query";
import type { JobDrawingsResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { drawingKeys } from "./keys";
import { jobDrawingsPath } from "./paths";

/** GET /jobs/:jobId/drawings: what the viewer may see, and what they may upload. */
export function listJobDrawings(
  jobId: string,
  signal?: AbortSignal,
): Promise<JobDrawingsResponse> {
  return api.get<JobDrawingsResponse>(jobDrawingsPath(jobId), signal);
}

export const jobDrawingsQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: drawingKeys.job(jobId),
    queryFn: ({ signal }) => listJobDrawings(jobId, signal),
  });

export function useJobDrawings(jobId: string) {
  return useQuery(jobDrawingsQueryOptions(jobId));
}
