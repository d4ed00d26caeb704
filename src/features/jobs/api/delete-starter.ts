import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { jobKeys } from "./keys";

/** Deletes a starting programme (owner); jobs made from it keep their programmes. */
export function deleteStarter(workshopId: string, starterId: string) {
  return api.delete(
    `/api/workshops/${encodeURIComponent(workshopId)}/starters/${encodeURIComponent(starterId)}`,
  );
}

export function useDeleteStarter(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (starterId: string) => deleteStarter(workshopId, starterId),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: jobKeys.starters(workshopId) }),
  });
}
