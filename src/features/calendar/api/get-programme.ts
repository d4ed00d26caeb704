import { queryOptions } from "@tanstack/react-query";
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

/**
 * One job's programme, asked for only when a drag or Move of one of its tasks starts: the
 * knock-on preview runs the engine on its input (the calendar itself needs no programme).
 */
export const calendarProgrammeQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: calendarKeys.programme(jobId),
    queryFn: ({ signal }) => getProgramme(jobId, signal),
  });
