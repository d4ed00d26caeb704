import { queryOptions, useQueries } from "@tanstack/react-query";
import type { JobDetail } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { jobPath } from "./get-programmes";
import { calendarKeys } from "./keys";

/** GET /api/jobs/:jobId: for a trade, the job with only their own bookings. */
export function getJobDetail(
  jobId: string,
  signal?: AbortSignal,
): Promise<JobDetail> {
  return api.get<JobDetail>(jobPath(jobId), signal);
}

export const calendarJobDetailQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: calendarKeys.jobDetail(jobId),
    queryFn: ({ signal }) => getJobDetail(jobId, signal),
  });

export function useJobDetails(jobIds: string[]) {
  return useQueries({
    queries: jobIds.map((id) => calendarJobDetailQueryOptions(id)),
  });
}
