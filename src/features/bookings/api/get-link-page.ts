import { queryOptions, useQuery } from "@tanstack/react-query";
import type { LinkPageResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { bookingKeys } from "./keys";

export const linkPagePath = (token: string) =>
  `/api/booking-links/${encodeURIComponent(token)}`;

/** The trade's confirmation page for one booking (no account needed). */
export function getLinkPage(
  token: string,
  signal?: AbortSignal,
): Promise<LinkPageResponse> {
  return api.get<LinkPageResponse>(linkPagePath(token), signal);
}

export const linkPageQueryOptions = (token: string) =>
  queryOptions({
    queryKey: bookingKeys.page(token),
    queryFn: ({ signal }) => getLinkPage(token, signal),
  });

export function useLinkPage(token: string) {
  return useQuery(linkPageQueryOptions(token));
}
