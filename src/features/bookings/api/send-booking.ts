import type { BookingResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { useBookingMutation } from "./booking-mutation";
import { bookingPath } from "./paths";

/** Send a draft: the e-mail with its calendar invitation and confirmation link. */
export function sendBooking(bookingId: string): Promise<BookingResponse> {
  return api.post<BookingResponse>(`${bookingPath(bookingId)}/send`);
}

export function useSendBooking(jobId: string) {
  return useBookingMutation(jobId, (bookingId: string) =>
    sendBooking(bookingId),
  );
}
