import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  CustomerResponse,
  customerBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { customerKeys } from "./keys";

export type CreateCustomerInput = z.output<typeof customerBodySchema>;

export function createCustomer(
  workshopId: string,
  body: CreateCustomerInput,
): Promise<CustomerResponse> {
  return api.post<CustomerResponse>(
    `/api/workshops/${encodeURIComponent(workshopId)}/customers`,
    body,
  );
}

export function useCreateCustomer(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateCustomerInput) => createCustomer(workshopId, body),
    onSuccess: () =>
      queryClient.invalidateQueries({
        queryKey: customerKeys.list(workshopId),
      }),
  });
}
