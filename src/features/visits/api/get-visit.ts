import { queryOptions, useQuery } from "@tanstack/react-query";
import type { VisitDetailResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { visitKeys } from "./keys";
import { visitPath } from "./paths";

/** GET /api/visits/:bookingId: one visit with what its confirmation page shows. */
export function getVisit(
  bookingId: string,
  signal?: AbortSignal,
): Promise<VisitDetailResponse> {
  return api.get<VisitDetailResponse>(visitPath(bookingId), signal);
}

export const visitQueryOptions = (bookingId: string) =>
  queryOptions({
    queryKey: visitKeys.detail(bookingId),
    queryFn: ({ signal }) => getVisit(bookingId, signal),
  });

export function useVisit(bookingId: string) {
  return useQuery(visitQueryOptions(bookingId));
}
