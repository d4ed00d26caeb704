import { queryOptions, useQuery } from "@tanstack/react-query";
import type { BookingOptionsResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { bookingKeys } from "./keys";

export function getBookingOptions(
  jobId: string,
  taskId: string,
  signal?: AbortSignal,
): Promise<BookingOptionsResponse> {
  return api.get<BookingOptionsResponse>(
    `/api/jobs/${encodeURIComponent(jobId)}/tasks/${encodeURIComponent(taskId)}/booking-options`,
    signal,
  );
}

export const bookingOptionsQueryOptions = (jobId: string, taskId: string) =>
  queryOptions({
    queryKey: bookingKeys.options(jobId, taskId),
    queryFn: ({ signal }) => getBookingOptions(jobId, taskId, signal),
    // First free starts move with every other booking: always ask afresh when the panel opens.
    staleTime: 0,
  });

export function useBookingOptions(jobId: string, taskId: string) {
  return useQuery(bookingOptionsQueryOptions(jobId, taskId));
}
