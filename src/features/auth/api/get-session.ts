import {
  queryOptions,
  useQuery,
  type QueryClient,
} from "@tanstack/react-query";
import type { SessionResponse } from "../../../../shared/schemas";
import { api, setCsrfToken } from "../../../lib/api-client";
import { authKeys } from "./keys";

export async function getSession(
  signal?: AbortSignal,
): Promise<SessionResponse> {
  const session = await api.get<SessionResponse>("/api/auth/session", signal);
  setCsrfToken(session.csrfToken);
  return session;
}

export const sessionQueryOptions = () =>
  queryOptions({
    queryKey: authKeys.session(),
    queryFn: ({ signal }) => getSession(signal),
    // The session changes only through sign-in/out (handled below) or expiry (a 401
    // anywhere invalidates it), so refetching on every focus adds nothing.
    staleTime: 5 * 60_000,
    refetchOnWindowFocus: false,
  });

export function useSession() {
  return useQuery(sessionQueryOptions());
}

/**
 * Record a new session (after sign-in, sign-out or set-password). The person may have
 * changed, so every other cached answer is dropped rather than shown to the wrong user.
 */
export function applySession(
  queryClient: QueryClient,
  session: SessionResponse,
): void {
  setCsrfToken(session.csrfToken);
  queryClient.removeQueries({
    predicate: (q) => q.queryKey[0] !== authKeys.all[0],
  });
  queryClient.setQueryData(authKeys.session(), session);
}
