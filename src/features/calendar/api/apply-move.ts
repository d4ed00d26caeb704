import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  applyResponseSchema,
  changeBodySchema,
  ProgrammeResponse,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { takeProgrammeEdit } from "../../../lib/programme-edit";
import { getProgramme, jobPath } from "./get-programme";
import { calendarKeys } from "./keys";

export type MoveBody = z.output<typeof changeBodySchema>;
/** The server's answer to a move: what changed (issue 15), not the whole programme. */
export type MoveChange = z.output<typeof applyResponseSchema>;
/** What a Save resolves to: the server's knock-on and the job's programme after it. */
export interface MoveAnswer {
  impact: MoveChange["impact"];
  programme: ProgrammeResponse;
}

/**
 * POST /api/jobs/:jobId/programme/apply — the programme screen's Save: the server recomputes the
 * knock-on, re-books the trades it moves and re-sends their invitations.
 */
export function applyMove(jobId: string, body: MoveBody): Promise<MoveChange> {
  return api.post<MoveChange>(`${jobPath(jobId)}/programme/apply`, body);
}

export function useApplyMove() {
  const queryClient = useQueryClient();
  return useMutation({
    // The server's answer laid over the cached programme (or the programme read again when
    // someone else changed it meanwhile), never the preview.
    mutationFn: async ({
      jobId,
      body,
    }: {
      jobId: string;
      body: MoveBody;
    }): Promise<MoveAnswer> => {
      const change = await applyMove(jobId, body);
      const programme = await takeProgrammeEdit(
        queryClient,
        {
          queryKey: calendarKeys.programme(jobId),
          queryFn: () => getProgramme(jobId),
        },
        change,
      );
      return { impact: change.impact, programme };
    },
    // Returned, so the save resolves once the days in view have been read again: the server's
    // dates, never the preview. Other jobs' programmes are read again at their next move (they
    // may share a re-booked trade).
    onSuccess: (_answer, { jobId }) => {
      const own = JSON.stringify(calendarKeys.programme(jobId));
      void queryClient.invalidateQueries({
        queryKey: calendarKeys.programmes(),
        refetchType: "none",
        predicate: (q) => JSON.stringify(q.queryKey) !== own,
      });
      return queryClient.invalidateQueries({ queryKey: calendarKeys.ranges() });
    },
  });
}
