import { queryOptions } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { bookingKeys } from "./keys";
import { bookingPath } from "./paths";

/** The booking's confirmation link, to paste into a text message. */
export function getBookingLink(
  bookingId: string,
  signal?: AbortSignal,
): Promise<{ url: string }> {
  return api.get<{ url: string }>(`${bookingPath(bookingId)}/link`, signal);
}

// Fetched on a click (queryClient.fetchQuery), never on render: the link changes with the dates.
export const bookingLinkQueryOptions = (bookingId: string) =>
  queryOptions({
    queryKey: bookingKeys.link(bookingId),
    queryFn: ({ signal }) => getBookingLink(bookingId, signal),
    staleTime: 0,
  });
