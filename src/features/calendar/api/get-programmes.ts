import { queryOptions, useQueries } from "@tanstack/react-query";
import type { ProgrammeResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { calendarKeys } from "./keys";

export function jobPath(jobId: string): string {
  return `/api/jobs/${encodeURIComponent(jobId)}`;
}

/** GET /api/jobs/:jobId/programme: tasks with planned dates, bookings and the engine input. */
export function getProgramme(
  jobId: string,
  signal?: AbortSignal,
): Promise<ProgrammeResponse> {
  return api.get<ProgrammeResponse>(`${jobPath(jobId)}/programme`, signal);
}

export const calendarProgrammeQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: calendarKeys.programme(jobId),
    queryFn: ({ signal }) => getProgramme(jobId, signal),
  });

/** Each job's programme (a workshop has a handful of live jobs: one request each). */
export function useProgrammes(jobIds: string[]) {
  return useQueries({
    queries: jobIds.map((id) => calendarProgrammeQueryOptions(id)),
  });
}
