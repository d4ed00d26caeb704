import { useMutation, useQueryClient } from "@tanstack/react-query";
import type {
  SetAwayDatesBody,
  TimelineResponse,
} from "../../../../shared/schemas";
import { apiRequest } from "../../../lib/api-client";
import { timelineKeys } from "./keys";
import { timelinePaths } from "./paths";

/** PUT /api/jobs/:jobId/away-dates: the whole list of coming away ranges; answers the new timeline. */
export function useSetAwayDates(jobId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: SetAwayDatesBody) =>
      apiRequest<TimelineResponse>(timelinePaths.awayDates(jobId), {
        method: "PUT",
        body,
      }),
    onSuccess: (answer) => client.setQueryData(timelineKeys.job(jobId), answer),
  });
}
