import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { drawingKeys } from "./keys";
import { drawingPath } from "./paths";

/** DELETE /drawings/:drawingId (owner): every revision's file goes with it. */
export function deleteDrawing(drawingId: string): Promise<void> {
  return api.delete(drawingPath(drawingId));
}

export function useDeleteDrawing(jobId: string, drawingId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => deleteDrawing(drawingId),
    onSuccess: () => {
      queryClient.removeQueries({ queryKey: drawingKeys.detail(drawingId) });
      return queryClient.invalidateQueries({
        queryKey: drawingKeys.job(jobId),
      });
    },
  });
}
