import { queryOptions, useQuery } from "@tanstack/react-query";
import type { ProgrammeResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { programmeKeys } from "./keys";

export function programmePath(jobId: string): string {
  return `/api/jobs/${encodeURIComponent(jobId)}`;
}

export function getProgramme(
  jobId: string,
  signal?: AbortSignal,
): Promise<ProgrammeResponse> {
  return api.get<ProgrammeResponse>(
    `${programmePath(jobId)}/programme`,
    signal,
  );
}

export const programmeQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: programmeKeys.detail(jobId),
    queryFn: ({ signal }) => getProgramme(jobId, signal),
  });

export function useProgramme(jobId: string) {
  return useQuery(programmeQueryOptions(jobId));
}
