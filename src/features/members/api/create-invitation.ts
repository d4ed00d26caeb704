import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  createInvitationBodySchema,
  InvitationResponse,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { memberKeys } from "./keys";

export type CreateInvitationInput = z.output<typeof createInvitationBodySchema>;

export function createInvitation(
  workshopId: string,
  body: CreateInvitationInput,
): Promise<InvitationResponse> {
  return api.post<InvitationResponse>(
    `/api/workshops/${encodeURIComponent(workshopId)}/invitations`,
    body,
  );
}

export function useCreateInvitation(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateInvitationInput) =>
      createInvitation(workshopId, body),
    onSuccess: () =>
      queryClient.invalidateQueries({
        queryKey: memberKeys.invitations(workshopId),
      }),
  });
}
