import { queryOptions, useQuery } from "@tanstack/react-query";
import type { MyVisitsResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { visitKeys } from "./keys";
import { myVisitsPath } from "./paths";

/** GET /api/me/visits: the trade's visits across every workshop they work for. */
export function listMyVisits(signal?: AbortSignal): Promise<MyVisitsResponse> {
  return api.get<MyVisitsResponse>(myVisitsPath, signal);
}

export const myVisitsQueryOptions = () =>
  queryOptions({
    queryKey: visitKeys.mine(),
    queryFn: ({ signal }) => listMyVisits(signal),
    // The workshop re-plans while the trade looks: pick up moved dates without a reload.
    refetchInterval: 30_000,
  });

export function useMyVisits() {
  return useQuery(myVisitsQueryOptions());
}
