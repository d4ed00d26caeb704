import { useMutation, useQueryClient } from "@tanstack/react-query";
import type {
  CustomerImportConfirm,
  CustomerImportPreview,
  CustomerImportResult,
  ImportFileBody,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { customerKeys } from "./keys";

const base = (workshopId: string) =>
  `/api/workshops/${encodeURIComponent(workshopId)}/customers`;

/** The CSV download of the workshop's customers. */
export const customersCsvUrl = (workshopId: string) =>
  `${base(workshopId)}.csv`;

/** Reads a CSV file into rows to choose from; nothing is saved. */
export function previewCustomerImport(
  workshopId: string,
  body: ImportFileBody,
): Promise<CustomerImportPreview> {
  return api.post<CustomerImportPreview>(
    `${base(workshopId)}/import/preview`,
    body,
  );
}

/** Adds the chosen rows, all or nothing. */
export function confirmCustomerImport(
  workshopId: string,
  body: CustomerImportConfirm,
): Promise<CustomerImportResult> {
  return api.post<CustomerImportResult>(`${base(workshopId)}/import`, body);
}

export function useConfirmCustomerImport(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CustomerImportConfirm) =>
      confirmCustomerImport(workshopId, body),
    onSuccess: () =>
      queryClient.invalidateQueries({
        queryKey: customerKeys.list(workshopId),
      }),
  });
}
