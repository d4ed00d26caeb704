import { queryOptions, useQuery } from "@tanstack/react-query";
import type { TradeResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { tradeKeys } from "./keys";

export async function listTrades(
  workshopId: string,
  signal?: AbortSignal,
): Promise<TradeResponse[]> {
  const body = await api.get<{ trades: TradeResponse[] }>(
    `/api/workshops/${encodeURIComponent(workshopId)}/trades`,
    signal,
  );
  return body.trades;
}

export const tradesQueryOptions = (workshopId: string) =>
  queryOptions({
    queryKey: tradeKeys.list(workshopId),
    queryFn: ({ signal }) => listTrades(workshopId, signal),
  });

export function useTrades(workshopId: string) {
  return useQuery(tradesQueryOptions(workshopId));
}
