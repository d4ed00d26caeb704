import type { BookingResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { useBookingMutation } from "./booking-mutation";
import { bookingPath } from "./paths";

/** Send an unanswered invitation again (a fresh e-mail, the same calendar event). */
export function chaseBooking(bookingId: string): Promise<BookingResponse> {
  return api.post<BookingResponse>(`${bookingPath(bookingId)}/chase`);
}

export function useChaseBooking(jobId: string) {
  return useBookingMutation(jobId, (bookingId: string) =>
    chaseBooking(bookingId),
  );
}
