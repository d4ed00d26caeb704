import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  TradeResponse,
  updateTradeBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { tradeKeys } from "./keys";

export type UpdateTradeInput = z.output<typeof updateTradeBodySchema>;

/** Edit a trade (PATCH: the fields sent are changed). */
export function updateTrade(
  tradeId: string,
  body: UpdateTradeInput,
): Promise<TradeResponse> {
  return api.patch<TradeResponse>(
    `/api/trades/${encodeURIComponent(tradeId)}`,
    body,
  );
}

export function useUpdateTrade() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (v: { tradeId: string; body: UpdateTradeInput }) =>
      updateTrade(v.tradeId, v.body),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: tradeKeys.lists() }),
  });
}
