import { queryOptions, useQuery } from "@tanstack/react-query";
import type { BookingResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { bookingKeys } from "./keys";

/** Bookings sent and not answered for longer than `hours`, oldest first, to chase. */
export function listUnanswered(
  workshopId: string,
  hours: number,
  signal?: AbortSignal,
): Promise<{ bookings: BookingResponse[] }> {
  return api.get<{ bookings: BookingResponse[] }>(
    `/api/workshops/${encodeURIComponent(workshopId)}/bookings/unanswered?hours=${hours}`,
    signal,
  );
}

export const unansweredQueryOptions = (workshopId: string, hours = 48) =>
  queryOptions({
    queryKey: bookingKeys.unanswered(workshopId, hours),
    queryFn: ({ signal }) => listUnanswered(workshopId, hours, signal),
    select: (d) => d.bookings,
  });

export function useUnansweredBookings(workshopId: string, hours = 48) {
  return useQuery(unansweredQueryOptions(workshopId, hours));
}
