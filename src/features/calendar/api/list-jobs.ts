import { queryOptions, useQuery } from "@tanstack/react-query";
import type { JobSummary } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { calendarKeys } from "./keys";

/** GET /api/jobs: every job the viewer may see, across the workshops they work with. */
export async function listCalendarJobs(
  signal?: AbortSignal,
): Promise<JobSummary[]> {
  const body = await api.get<{ jobs: JobSummary[] }>("/api/jobs", signal);
  return body.jobs;
}

export const calendarJobsQueryOptions = () =>
  queryOptions({
    queryKey: calendarKeys.jobs(),
    queryFn: ({ signal }) => listCalendarJobs(signal),
  });

export function useCalendarJobs() {
  return useQuery(calendarJobsQueryOptions());
}
