import { useMutation } from "@tanstack/react-query";
import type { RunningLateBody, Visit } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { visitPath } from "./paths";
import { useRefreshVisits } from "./refresh";

/** POST /visits/:id/running-late: the new arrival time, told to the workshop. */
export function useRunningLate(bookingId: string) {
  const refresh = useRefreshVisits();
  return useMutation({
    mutationFn: (body: RunningLateBody) =>
      api.post<Visit>(`${visitPath(bookingId)}/running-late`, body),
    onSuccess: refresh,
  });
}
