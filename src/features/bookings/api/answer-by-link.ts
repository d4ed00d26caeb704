import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  LinkPageResponse,
  linkAnswerBodySchema,
} from "../../../../shared/schemas";
import { api, isApiError } from "../../../lib/api-client";
import { bookingKeys } from "./keys";
import { linkPagePath } from "./get-link-page";

export type LinkAnswerInput = z.output<typeof linkAnswerBodySchema>;

/** Confirm, decline or propose another start by link; answers with the page as it now stands. */
export function answerByLink(
  token: string,
  body: LinkAnswerInput,
): Promise<LinkPageResponse> {
  return api.post<LinkPageResponse>(`${linkPagePath(token)}/answer`, body);
}

export function useAnswerByLink(token: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: LinkAnswerInput) => answerByLink(token, body),
    onSuccess: (page) =>
      queryClient.setQueryData(bookingKeys.page(token), page),
    onError: (error) => {
      // 409: the dates changed since this link; re-read the page, which now says so.
      if (isApiError(error) && error.status === 409)
        return queryClient.invalidateQueries({
          queryKey: bookingKeys.page(token),
        });
    },
  });
}
