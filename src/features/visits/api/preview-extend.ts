import { useMutation } from "@tanstack/react-query";
import type { ExtendImpact } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { visitPath } from "./paths";

/** POST /visits/:id/extend/preview: the knock-on of one more day, nothing saved. */
export function usePreviewExtend(bookingId: string) {
  return useMutation({
    mutationFn: () =>
      api.post<ExtendImpact>(`${visitPath(bookingId)}/extend/preview`),
  });
}
