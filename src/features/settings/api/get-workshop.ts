import { queryOptions, useQuery } from "@tanstack/react-query";
import type { WorkshopResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { settingsKeys } from "./keys";

/** The workshop's settings (GET /workshops/:id). */
export function getWorkshop(
  workshopId: string,
  signal?: AbortSignal,
): Promise<WorkshopResponse> {
  return api.get<WorkshopResponse>(
    `/api/workshops/${encodeURIComponent(workshopId)}`,
    signal,
  );
}

export const workshopQueryOptions = (workshopId: string) =>
  queryOptions({
    queryKey: settingsKeys.detail(workshopId),
    queryFn: ({ signal }) => getWorkshop(workshopId, signal),
  });

/** The workshop's settings, for its members. */
export function useWorkshop(workshopId: string | undefined) {
  return useQuery({
    ...workshopQueryOptions(workshopId ?? ""),
    enabled: !!workshopId,
  });
}
