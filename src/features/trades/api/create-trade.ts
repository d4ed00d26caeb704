import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  TradeResponse,
  tradeBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { tradeKeys } from "./keys";

export type CreateTradeInput = z.output<typeof tradeBodySchema>;

export function createTrade(
  workshopId: string,
  body: CreateTradeInput,
): Promise<TradeResponse> {
  return api.post<TradeResponse>(
    `/api/workshops/${encodeURIComponent(workshopId)}/trades`,
    body,
  );
}

export function useCreateTrade(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateTradeInput) => createTrade(workshopId, body),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: tradeKeys.list(workshopId) }),
  });
}
