import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  createJobBodySchema,
  JobDetail,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { jobKeys } from "./keys";

export type CreateJobInput = z.output<typeof createJobBodySchema>;

export function createJob(
  workshopId: string,
  body: CreateJobInput,
): Promise<JobDetail> {
  return api.post<JobDetail>(
    `/api/workshops/${encodeURIComponent(workshopId)}/jobs`,
    body,
  );
}

export function useCreateJob(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateJobInput) => createJob(workshopId, body),
    onSuccess: (job) => {
      queryClient.setQueryData(jobKeys.detail(job.id), job);
      return queryClient.invalidateQueries({ queryKey: jobKeys.lists() });
    },
  });
}
