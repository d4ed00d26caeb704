import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { jobKeys } from "./keys";

export function deleteJob(jobId: string): Promise<void> {
  return api.delete(`/api/jobs/${encodeURIComponent(jobId)}`);
}

export function useDeleteJob(jobId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => deleteJob(jobId),
    onSuccess: () => {
      queryClient.removeQueries({ queryKey: jobKeys.detail(jobId) });
      return queryClient.invalidateQueries({ queryKey: jobKeys.lists() });
    },
  });
}
