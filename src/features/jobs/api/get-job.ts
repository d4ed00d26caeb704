import { queryOptions, useQuery } from "@tanstack/react-query";
import type { JobDetail } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { jobKeys } from "./keys";

export function getJob(
  jobId: string,
  signal?: AbortSignal,
): Promise<JobDetail> {
  return api.get<JobDetail>(`/api/jobs/${encodeURIComponent(jobId)}`, signal);
}

export const jobQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: jobKeys.detail(jobId),
    queryFn: ({ signal }) => getJob(jobId, signal),
  });

export function useJob(jobId: string) {
  return useQuery(jobQueryOptions(jobId));
}
