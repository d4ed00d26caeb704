import { queryOptions, useQuery } from "@tanstack/react-query";
import type { StarterResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { jobKeys } from "./keys";

/** The workshop's starting programmes, offered when a job is created. */
export function listStarters(
  workshopId: string,
  signal?: AbortSignal,
): Promise<{ starters: StarterResponse[] }> {
  return api.get<{ starters: StarterResponse[] }>(
    `/api/workshops/${encodeURIComponent(workshopId)}/starters`,
    signal,
  );
}

export const startersQueryOptions = (workshopId: string) =>
  queryOptions({
    queryKey: jobKeys.starters(workshopId),
    queryFn: ({ signal }) => listStarters(workshopId, signal),
  });

export function useStarters(workshopId: string) {
  return useQuery(startersQueryOptions(workshopId));
}
