import {
  queryOptions,
  useQuery,
  useQueryClient,
  type QueryClient,
} from "@tanstack/react-query";
import {
  THREAD_POLL_MS,
  type ThreadQuery,
  type ThreadResponse,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { threadKeys } from "./keys";
import { threadPaths, withQuery } from "./paths";

export function getThread(
  jobId: string,
  query: ThreadQuery = {},
  signal?: AbortSignal,
): Promise<ThreadResponse> {
  return api.get<ThreadResponse>(
    withQuery(threadPaths.thread(jobId), {
      after: query.after,
      before: query.before,
      limit: query.limit,
    }),
    signal,
  );
}

/**
 * Folds a newer answer into what is cached: messages by `seq` (a message seen twice keeps the
 * newer copy), oldest first. The counts and read position are the server's latest, but the read
 * position never moves backwards (a poll that left before a mark-read answered after it).
 */
export function mergeThread(
  cached: ThreadResponse,
  next: ThreadResponse,
  { earlier = false }: { earlier?: boolean } = {},
): ThreadResponse {
  const bySeq = new Map(cached.messages.map((m) => [m.seq, m]));
  for (const m of next.messages) bySeq.set(m.seq, m);
  const lastReadSeq = Math.max(cached.lastReadSeq, next.lastReadSeq);
  const messages = [...bySeq.values()]
    .sort((a, b) => a.seq - b.seq)
    .map((m) =>
      m.unread && m.seq <= lastReadSeq ? { ...m, unread: false } : m,
    );
  return {
    ...next,
    messages,
    // Only a page of earlier messages says whether there are more before it.
    hasEarlier: earlier ? next.hasEarlier : cached.hasEarlier,
    cursor: Math.max(cached.cursor, next.cursor),
    lastReadSeq,
    unreadCount:
      next.lastReadSeq < cached.lastReadSeq
        ? Math.min(cached.unreadCount, next.unreadCount)
        : next.unreadCount,
  };
}

/**
 * The thread, polled every THREAD_POLL_MS while the tab is visible (DEVELOPERS.md, Decisions):
 * the first load takes the latest messages; every poll after it asks only for those `after`
 * the cursor and merges them into the cached list, so a poll costs one indexed range read.
 */
export const threadQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: threadKeys.job(jobId),
    queryFn: async ({ signal, client }) => {
      const cached = client.getQueryData<ThreadResponse>(threadKeys.job(jobId));
      if (!cached) return getThread(jobId, {}, signal);
      const next = await getThread(jobId, { after: cached.cursor }, signal);
      // Read the cache again: a send or a mark-read may have written it meanwhile.
      const now =
        client.getQueryData<ThreadResponse>(threadKeys.job(jobId)) ?? cached;
      return mergeThread(now, next);
    },
    refetchInterval: THREAD_POLL_MS,
    // Paused in a hidden tab (TanStack's default, said here because it is the point).
    refetchIntervalInBackground: false,
    staleTime: THREAD_POLL_MS,
  });

export function useThread(jobId: string) {
  return useQuery(threadQueryOptions(jobId));
}

/** Loads the page of messages before the oldest one shown and merges it in. */
export async function loadEarlier(
  client: QueryClient,
  jobId: string,
): Promise<void> {
  const cached = client.getQueryData<ThreadResponse>(threadKeys.job(jobId));
  if (!cached || cached.messages.length === 0) return;
  const page = await getThread(jobId, { before: cached.messages[0].seq });
  const now =
    client.getQueryData<ThreadResponse>(threadKeys.job(jobId)) ?? cached;
  client.setQueryData(
    threadKeys.job(jobId),
    mergeThread(now, page, { earlier: true }),
  );
}

/** Fetches what is new right away (after a send) instead of waiting for the next poll. */
export function useRefreshThread(jobId: string): () => Promise<void> {
  const client = useQueryClient();
  return () => client.refetchQueries({ queryKey: threadKeys.job(jobId) });
}
