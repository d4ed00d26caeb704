import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  VisitDetailResponse,
  linkAnswerBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { visitKeys } from "./keys";
import { visitPath } from "./paths";
import { useRefreshVisits } from "./refresh";

export type VisitAnswer = z.output<typeof linkAnswerBodySchema>;

/** POST /visits/:id/answer: confirm, decline or propose another start. */
export function useAnswerVisit(bookingId: string) {
  const refresh = useRefreshVisits();
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: VisitAnswer) =>
      api.post<VisitDetailResponse>(`${visitPath(bookingId)}/answer`, body),
    onSuccess: async (detail) => {
      queryClient.setQueryData(visitKeys.detail(bookingId), detail);
      await refresh();
    },
  });
}
