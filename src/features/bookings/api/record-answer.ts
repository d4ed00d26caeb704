import type { z } from "zod";
import type {
  BookingResponse,
  recordAnswerBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { useBookingMutation } from "./booking-mutation";
import { bookingPath } from "./paths";

export type RecordAnswerInput = z.output<typeof recordAnswerBodySchema>;

/** Record the trade's answer given by phone or text, on their behalf. */
export function recordAnswer(
  bookingId: string,
  body: RecordAnswerInput,
): Promise<BookingResponse> {
  return api.post<BookingResponse>(`${bookingPath(bookingId)}/answer`, body);
}

export function useRecordAnswer(jobId: string) {
  return useBookingMutation(
    jobId,
    (v: { bookingId: string; body: RecordAnswerInput }) =>
      recordAnswer(v.bookingId, v.body),
  );
}
