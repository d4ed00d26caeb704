import { queryOptions, useQuery } from "@tanstack/react-query";
import type { CustomerResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { customerKeys } from "./keys";

export async function listCustomers(
  workshopId: string,
  signal?: AbortSignal,
): Promise<CustomerResponse[]> {
  const body = await api.get<{ customers: CustomerResponse[] }>(
    `/api/workshops/${encodeURIComponent(workshopId)}/customers`,
    signal,
  );
  return body.customers;
}

export const customersQueryOptions = (workshopId: string) =>
  queryOptions({
    queryKey: customerKeys.list(workshopId),
    queryFn: ({ signal }) => listCustomers(workshopId, signal),
  });

export function useCustomers(
  workshopId: string,
  options: { enabled?: boolean } = {},
) {
  return useQuery({
    ...customersQueryOptions(workshopId),
    enabled: options.enabled ?? true,
  });
}
