import { queryOptions, useQuery } from "@tanstack/react-query";
import type { JobSummary } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { jobKeys } from "./keys";

export async function listJobs(signal?: AbortSignal): Promise<JobSummary[]> {
  const body = await api.get<{ jobs: JobSummary[] }>("/api/jobs", signal);
  return body.jobs;
}

export const jobsQueryOptions = () =>
  queryOptions({
    queryKey: jobKeys.lists(),
    queryFn: ({ signal }) => listJobs(signal),
  });

export function useJobs() {
  return useQuery(jobsQueryOptions());
}
