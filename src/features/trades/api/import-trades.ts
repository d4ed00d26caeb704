import { useMutation, useQueryClient } from "@tanstack/react-query";
import type {
  ImportFileBody,
  TradeImportConfirm,
  TradeImportPreview,
  TradeImportResult,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { tradeKeys } from "./keys";

const base = (workshopId: string) =>
  `/api/workshops/${encodeURIComponent(workshopId)}/trades`;

/** The CSV download of the workshop's trades. */
export const tradesCsvUrl = (workshopId: string) => `${base(workshopId)}.csv`;

/** Reads a vCard or CSV file into rows to choose from; nothing is saved. */
export function previewTradeImport(
  workshopId: string,
  body: ImportFileBody,
): Promise<TradeImportPreview> {
  return api.post<TradeImportPreview>(
    `${base(workshopId)}/import/preview`,
    body,
  );
}

/** Adds the chosen rows, all or nothing. */
export function confirmTradeImport(
  workshopId: string,
  body: TradeImportConfirm,
): Promise<TradeImportResult> {
  return api.post<TradeImportResult>(`${base(workshopId)}/import`, body);
}

export function useConfirmTradeImport(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: TradeImportConfirm) =>
      confirmTradeImport(workshopId, body),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: tradeKeys.list(workshopId) }),
  });
}
