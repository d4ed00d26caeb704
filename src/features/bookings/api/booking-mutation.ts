import { useMutation, useQueryClient } from "@tanstack/react-query";
import { bookingKeys } from "./keys";

/**
 * Every booking change answers with the booking; the job's list and every task's options are
 * refetched (a booking moves other first free starts), then the caller's own refresh runs.
 */
export function useBookingMutation<TVars, TAnswer>(
  jobId: string,
  mutationFn: (vars: TVars) => Promise<TAnswer>,
) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn,
    onSettled: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: bookingKeys.job(jobId) }),
        queryClient.invalidateQueries({
          queryKey: bookingKeys.unansweredAll(),
        }),
      ]),
  });
}

/** After a programme change re-books tasks on the server, the bookings shown must be re-read. */
export function useRefreshJobBookings(jobId: string): () => Promise<void> {
  const queryClient = useQueryClient();
  return () =>
    queryClient.invalidateQueries({ queryKey: bookingKeys.job(jobId) });
}
