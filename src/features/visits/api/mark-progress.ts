import { useMutation } from "@tanstack/react-query";
import type { Visit, VisitProgressBody } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { visitPath } from "./paths";
import { useRefreshVisits } from "./refresh";

/** POST /visits/:id/progress: their own task started or done, now. */
export function useMarkProgress(bookingId: string) {
  const refresh = useRefreshVisits();
  return useMutation({
    mutationFn: (body: VisitProgressBody) =>
      api.post<Visit>(`${visitPath(bookingId)}/progress`, body),
    onSuccess: refresh,
  });
}
