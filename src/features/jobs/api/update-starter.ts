import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { StarterBody, StarterResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { jobKeys } from "./keys";

/** Replaces a starting programme's name, tasks and links (PUT …/starters/:id). */
export function updateStarter(
  workshopId: string,
  starterId: string,
  body: StarterBody,
): Promise<StarterResponse> {
  return api.put<StarterResponse>(
    `/api/workshops/${encodeURIComponent(workshopId)}/starters/${encodeURIComponent(starterId)}`,
    body,
  );
}

export function useUpdateStarter(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: StarterBody }) =>
      updateStarter(workshopId, id, body),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: jobKeys.starters(workshopId) }),
  });
}
