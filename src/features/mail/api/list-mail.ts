import { queryOptions, useQuery } from "@tanstack/react-query";
import type { CaughtMail } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { mailKeys } from "./keys";

export async function listMail(signal?: AbortSignal): Promise<CaughtMail[]> {
  const body = await api.get<{ messages: CaughtMail[] }>(
    "/api/dev/mail",
    signal,
  );
  return body.messages;
}

export const mailQueryOptions = () =>
  queryOptions({
    queryKey: mailKeys.list(),
    queryFn: ({ signal }) => listMail(signal),
    // New mail arrives from actions in other tabs; poll gently while the page is open.
    refetchInterval: 5000,
    staleTime: 0,
  });

export function useMail() {
  return useQuery(mailQueryOptions());
}
