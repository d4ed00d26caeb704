import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  applyResponseSchema,
  changeBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { jobPath } from "./get-programme";
import { calendarKeys } from "./keys";

export type MoveBody = z.output<typeof changeBodySchema>;
export type MoveAnswer = z.output<typeof applyResponseSchema>;

/**
 * POST /api/jobs/:jobId/programme/apply — the programme screen's Save: the server recomputes the
 * knock-on, re-books the trades it moves and re-sends their invitations.
 */
export function applyMove(jobId: string, body: MoveBody): Promise<MoveAnswer> {
  return api.post<MoveAnswer>(`${jobPath(jobId)}/programme/apply`, body);
}

export function useApplyMove() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ jobId, body }: { jobId: string; body: MoveBody }) =>
      applyMove(jobId, body),
    // Returned, so the save resolves once the days in view have been read again: the
    // server's dates, never the preview. Programmes are read again at the next move (another
    // job may share a re-booked trade).
    onSuccess: (answer, { jobId }) => {
      queryClient.setQueryData(calendarKeys.programme(jobId), answer.programme);
      void queryClient.invalidateQueries({
        queryKey: calendarKeys.programmes(),
        refetchType: "none",
      });
      return queryClient.invalidateQueries({ queryKey: calendarKeys.ranges() });
    },
  });
}
