import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  JobDetail,
  updateJobBodySchema,
} from "../../../../shared/schemas";
import { api, isApiError } from "../../../lib/api-client";
import { jobKeys } from "./keys";

export type UpdateJobInput = z.output<typeof updateJobBodySchema>;

export function updateJob(
  jobId: string,
  body: UpdateJobInput,
): Promise<JobDetail> {
  return api.patch<JobDetail>(`/api/jobs/${encodeURIComponent(jobId)}`, body);
}

export function useUpdateJob(jobId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: UpdateJobInput) => updateJob(jobId, body),
    onSuccess: (job) => {
      queryClient.setQueryData(jobKeys.detail(jobId), job);
      return queryClient.invalidateQueries({ queryKey: jobKeys.lists() });
    },
    onError: (error) => {
      // Someone else saved first: load their version so the next attempt starts from it.
      if (isApiError(error) && error.code === "version-conflict") {
        return queryClient.invalidateQueries({
          queryKey: jobKeys.detail(jobId),
        });
      }
    },
  });
}
