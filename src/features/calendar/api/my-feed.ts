import {
  queryOptions,
  useMutation,
  useQuery,
  useQueryClient,
} from "@tanstack/react-query";
import type {
  FeedCreatedResponse,
  FeedStatusResponse,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { calendarKeys } from "./keys";

/** GET /api/me/feed: whether a feed URL exists (the URL itself is shown only when made). */
export const myFeedQueryOptions = () =>
  queryOptions({
    queryKey: calendarKeys.feed(),
    queryFn: ({ signal }) =>
      api.get<FeedStatusResponse>("/api/me/feed", signal),
  });

export function useMyFeed() {
  return useQuery(myFeedQueryOptions());
}

/** POST /api/me/feed: a new secret URL (the old one stops working). */
export function useMakeMyFeed() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<FeedCreatedResponse>("/api/me/feed"),
    onSuccess: () =>
      void queryClient.invalidateQueries({ queryKey: calendarKeys.feed() }),
  });
}

/** DELETE /api/me/feed: revoke the URL. */
export function useRevokeMyFeed() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api.delete("/api/me/feed"),
    onSuccess: () =>
      void queryClient.invalidateQueries({ queryKey: calendarKeys.feed() }),
  });
}
