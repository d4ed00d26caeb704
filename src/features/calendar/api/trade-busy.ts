import { queryOptions, useQuery } from "@tanstack/react-query";
import type { TradeBusyResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { calendarKeys } from "./keys";

/** GET /api/trades/:tradeId/busy: this workshop's bookings of the trade by name, other workshops' only as busy. */
export async function getTradeBusy(
  tradeId: string,
  from: string,
  to: string,
  signal?: AbortSignal,
): Promise<TradeBusyResponse["busy"]> {
  const body = await api.get<TradeBusyResponse>(
    `/api/trades/${tradeId}/busy?from=${from}&to=${to}`,
    signal,
  );
  return body.busy;
}

export const tradeBusyQueryOptions = (
  tradeId: string,
  from: string,
  to: string,
) =>
  queryOptions({
    queryKey: calendarKeys.tradeBusy(tradeId, from, to),
    queryFn: ({ signal }) => getTradeBusy(tradeId, from, to, signal),
  });

/** The busy days of the range in view; the last range's stay while the next loads (same trade). */
export function useTradeBusy(tradeId: string | null, from: string, to: string) {
  return useQuery({
    ...tradeBusyQueryOptions(tradeId ?? "", from, to),
    enabled: !!tradeId,
    placeholderData: (previous, previousQuery) =>
      previousQuery?.queryKey[2] === tradeId ? previous : undefined,
  });
}
