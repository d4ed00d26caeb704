import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { OutboxRetryResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { attentionKeys } from "./keys";

/** Puts a failed e-mail of the workshop back in the queue (same Message-ID, attempts reset). */
export function retryMail(
  workshopId: string,
  messageId: string,
): Promise<OutboxRetryResponse> {
  return api.post<OutboxRetryResponse>(
    `/api/workshops/${encodeURIComponent(workshopId)}/outbox/${encodeURIComponent(messageId)}/retry`,
  );
}

/** Once it is queued (or refused), the attention list is read again: the item goes when it is. */
export function useRetryMail(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (messageId: string) => retryMail(workshopId, messageId),
    onSettled: () =>
      queryClient.invalidateQueries({
        queryKey: attentionKeys.workshop(workshopId),
      }),
  });
}
