import type { z } from "zod";
import type {
  BookingResponse,
  updateBookingBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { useBookingMutation } from "./booking-mutation";
import { bookingPath } from "./paths";

export type UpdateBookingInput = z.output<typeof updateBookingBodySchema>;

/** Change a draft booking; 409 once it is sent, or on a clash unless `overrideReason` is given. */
export function updateBooking(
  bookingId: string,
  body: UpdateBookingInput,
): Promise<BookingResponse> {
  return api.patch<BookingResponse>(bookingPath(bookingId), body);
}

export function useUpdateBooking(jobId: string) {
  return useBookingMutation(
    jobId,
    (v: { bookingId: string; body: UpdateBookingInput }) =>
      updateBooking(v.bookingId, v.body),
  );
}
