import type { z } from "zod";
import type {
  BookingResponse,
  cancelBookingBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { useBookingMutation } from "./booking-mutation";
import { bookingPath } from "./paths";

export type CancelBookingInput = z.output<typeof cancelBookingBodySchema>;

/** Cancel a booking; the trade gets a calendar cancellation. */
export function cancelBooking(
  bookingId: string,
  body: CancelBookingInput,
): Promise<BookingResponse> {
  return api.post<BookingResponse>(`${bookingPath(bookingId)}/cancel`, body);
}

export function useCancelBooking(jobId: string) {
  return useBookingMutation(
    jobId,
    (v: { bookingId: string; body: CancelBookingInput }) =>
      cancelBooking(v.bookingId, v.body),
  );
}
