import { useMutation } from "@tanstack/react-query";
import type {
  SettingsPreview,
  UpdateWorkshopBody,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";

/** What a settings change would do to the open jobs, computed by the server; nothing is saved. */
export function previewSettings(
  workshopId: string,
  body: UpdateWorkshopBody,
): Promise<SettingsPreview> {
  return api.post<SettingsPreview>(
    `/api/workshops/${encodeURIComponent(workshopId)}/settings/preview`,
    body,
  );
}

export function usePreviewSettings(workshopId: string) {
  return useMutation({
    mutationFn: (body: UpdateWorkshopBody) => previewSettings(workshopId, body),
  });
}
