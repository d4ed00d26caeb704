import { useMutation, useQueryClient } from "@tanstack/react-query";
import type {
  MarkReadBody,
  MarkReadResponse,
  ThreadResponse,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { threadKeys } from "./keys";
import { threadPaths } from "./paths";

export function markThreadRead(
  jobId: string,
  body: MarkReadBody,
): Promise<MarkReadResponse> {
  return api.post<MarkReadResponse>(threadPaths.read(jobId), body);
}

/** Marks the thread read up to `seq`; the cached thread takes the server's new position and count. */
export function useMarkThreadRead(jobId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (seq: number) => markThreadRead(jobId, { seq }),
    onSuccess: (answer) => {
      client.setQueryData<ThreadResponse>(threadKeys.job(jobId), (cached) => {
        if (!cached) return cached;
        const lastReadSeq = Math.max(cached.lastReadSeq, answer.lastReadSeq);
        return {
          ...cached,
          lastReadSeq,
          unreadCount: answer.unreadCount,
          messages: cached.messages.map((m) =>
            m.unread && m.seq <= lastReadSeq ? { ...m, unread: false } : m,
          ),
        };
      });
    },
  });
}
