import { useMutation, useQueryClient } from "@tanstack/react-query";
import type {
  UpdateWorkshopBody,
  WorkshopResponse,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { settingsKeys } from "./keys";

/** Changes the workshop's settings (PATCH /workshops/:id); the server re-plans open jobs. */
export function updateWorkshop(
  workshopId: string,
  body: UpdateWorkshopBody,
): Promise<WorkshopResponse> {
  return api.patch<WorkshopResponse>(
    `/api/workshops/${encodeURIComponent(workshopId)}`,
    body,
  );
}

/** The settings change; afterwards every cached screen is asked again (programmes may have moved). */
export function useUpdateWorkshop(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: UpdateWorkshopBody) => updateWorkshop(workshopId, body),
    onSuccess: (w) => {
      queryClient.setQueryData(settingsKeys.detail(workshopId), w);
      // A change of days, hours or nation re-plans every open job: programmes, calendars,
      // the attention list and bookings all read it, so nothing cached is kept.
      return queryClient.invalidateQueries();
    },
  });
}
