import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { tradeKeys } from "./keys";

export function deleteTrade(tradeId: string): Promise<void> {
  return api.delete(`/api/trades/${encodeURIComponent(tradeId)}`);
}

export function useDeleteTrade() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteTrade,
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: tradeKeys.lists() }),
  });
}
