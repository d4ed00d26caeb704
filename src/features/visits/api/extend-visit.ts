import { useMutation } from "@tanstack/react-query";
import type { ExtendImpact, Visit } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { visitPath } from "./paths";
import { useRefreshVisits } from "./refresh";

/** POST /visits/:id/extend: one more day, at the programme version previewed. */
export function useExtendVisit(bookingId: string) {
  const refresh = useRefreshVisits();
  return useMutation({
    mutationFn: (version: number) =>
      api.post<{ impact: ExtendImpact; visit: Visit }>(
        `${visitPath(bookingId)}/extend`,
        { version },
      ),
    onSuccess: refresh,
  });
}
