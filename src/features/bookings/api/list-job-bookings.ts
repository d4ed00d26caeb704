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
  });

export function useJobBookings(jobId: string) {
  return useQuery(jobBookingsQueryOptions(jobId));
}
