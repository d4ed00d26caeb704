import { queryOptions, useQuery } from "@tanstack/react-query";
import type { BookingResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { bookingKeys } from "./keys";

export function listJobBookings(
  jobId: string,
  signal?: AbortSignal,
): Promise<{ bookings: BookingResponse[] }> {
  return api.get<{ bookings: BookingResponse[] }>(
    `/api/jobs/${encodeURIComponent(jobId)}/bookings`,
    signal,
  );
}

export const jobBookingsQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: bookingKeys.list(jobId),
    queryFn: ({ signal }) => listJobBookings(jobId, signal),
    select: (d) => d.bookings,
    // A trade answers by link or from their calendar app at any moment: the maker sees it
    // within a few seconds without reloading (polling the database, so any app process will do).
    refetchInterval: 10_000,
  });

export function useJobBookings(jobId: string) {
  return useQuery(jobBookingsQueryOptions(jobId));
}
