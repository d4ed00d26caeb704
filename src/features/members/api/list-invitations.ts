import { queryOptions, useQuery } from "@tanstack/react-query";
import type { InvitationResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { memberKeys } from "./keys";

export async function listInvitations(
  workshopId: string,
  signal?: AbortSignal,
): Promise<InvitationResponse[]> {
  const body = await api.get<{ invitations: InvitationResponse[] }>(
    `/api/workshops/${encodeURIComponent(workshopId)}/invitations`,
    signal,
  );
  return body.invitations;
}

export const invitationsQueryOptions = (workshopId: string) =>
  queryOptions({
    queryKey: memberKeys.invitations(workshopId),
    queryFn: ({ signal }) => listInvitations(workshopId, signal),
  });

export function useInvitations(workshopId: string) {
  return useQuery(invitationsQueryOptions(workshopId));
}
