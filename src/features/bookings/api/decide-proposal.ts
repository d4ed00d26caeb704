import type { z } from "zod";
import type {
  BookingResponse,
  proposalDecisionBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { useBookingMutation } from "./booking-mutation";
import { bookingPath } from "./paths";

export type ProposalDecisionInput = z.output<typeof proposalDecisionBodySchema>;

/** Accept (reschedules through the engine) or reject the start the trade proposed. */
export function decideProposal(
  bookingId: string,
  body: ProposalDecisionInput,
): Promise<BookingResponse> {
  return api.post<BookingResponse>(`${bookingPath(bookingId)}/proposal`, body);
}

export function useDecideProposal(jobId: string) {
  return useBookingMutation(
    jobId,
    (v: { bookingId: string; body: ProposalDecisionInput }) =>
      decideProposal(v.bookingId, v.body),
  );
}
