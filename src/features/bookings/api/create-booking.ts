import type { z } from "zod";
import type {
  BookingResponse,
  createBookingBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { useBookingMutation } from "./booking-mutation";

export type CreateBookingInput = z.output<typeof createBookingBodySchema>;

/** Book a trade for a task; 409 "conflict" on a clash or day off unless `overrideReason` is given. */
export function createBooking(
  jobId: string,
  body: CreateBookingInput,
): Promise<BookingResponse> {
  return api.post<BookingResponse>(
    `/api/jobs/${encodeURIComponent(jobId)}/bookings`,
    body,
  );
}

export function useCreateBooking(jobId: string) {
  return useBookingMutation(jobId, (body: CreateBookingInput) =>
    createBooking(jobId, body),
  );
}
