import { queryOptions, useQuery } from "@tanstack/react-query";
import type { TokenInfoResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { authKeys } from "./keys";

export function getTokenInfo(
  token: string,
  signal?: AbortSignal,
): Promise<TokenInfoResponse> {
  return api.get<TokenInfoResponse>(
    `/api/auth/tokens/${encodeURIComponent(token)}`,
    signal,
  );
}

export const tokenInfoQueryOptions = (token: string) =>
  queryOptions({
    queryKey: authKeys.token(token),
    queryFn: ({ signal }) => getTokenInfo(token, signal),
    staleTime: Infinity,
  });

export function useTokenInfo(token: string) {
  return useQuery(tokenInfoQueryOptions(token));
}
