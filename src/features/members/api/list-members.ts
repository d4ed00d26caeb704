import { queryOptions, useQuery } from "@tanstack/react-query";
import type { MemberResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { memberKeys } from "./keys";

export async function listMembers(
  workshopId: string,
  signal?: AbortSignal,
): Promise<MemberResponse[]> {
  const body = await api.get<{ members: MemberResponse[] }>(
    `/api/workshops/${encodeURIComponent(workshopId)}/members`,
    signal,
  );
  return body.members;
}

export const membersQueryOptions = (workshopId: string) =>
  queryOptions({
    queryKey: memberKeys.list(workshopId),
    queryFn: ({ signal }) => listMembers(workshopId, signal),
  });

export function useMembers(workshopId: string) {
  return useQuery(membersQueryOptions(workshopId));
}
