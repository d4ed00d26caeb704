import { queryOptions, useQuery } from "@tanstack/react-query";
import type { AttentionResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { attentionKeys } from "./keys";

/** What needs the workshop now across its open jobs, most urgent first. */
export function getAttention(
  workshopId: string,
  signal?: AbortSignal,
): Promise<AttentionResponse> {
  return api.get<AttentionResponse>(
    `/api/workshops/${encodeURIComponent(workshopId)}/attention`,
    signal,
  );
}

/** Refetched every 30 s, so an answer by link or a new message shows up on the home page unasked. */
export const attentionQueryOptions = (workshopId: string) =>
  queryOptions({
    queryKey: attentionKeys.workshop(workshopId),
    queryFn: ({ signal }) => getAttention(workshopId, signal),
    // Fresh each time home is opened: the maker has usually just fixed something elsewhere.
    staleTime: 0,
    refetchInterval: 30_000,
  });

export function useAttention(workshopId: string) {
  return useQuery(attentionQueryOptions(workshopId));
}
