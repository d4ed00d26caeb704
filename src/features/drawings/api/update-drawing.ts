import { useMutation, useQueryClient } from "@tanstack/react-query";
import type {
  DrawingDetail,
  UpdateDrawingBody,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { drawingKeys } from "./keys";
import { drawingPath } from "./paths";

/** PATCH /drawings/:drawingId (workshop): title, linked tasks, sharing. */
export function updateDrawing(
  drawingId: string,
  body: UpdateDrawingBody,
): Promise<DrawingDetail> {
  return api.patch<DrawingDetail>(drawingPath(drawingId), body);
}

export function useUpdateDrawing(jobId: string, drawingId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: UpdateDrawingBody) => updateDrawing(drawingId, body),
    onSuccess: (drawing) =>
      queryClient.setQueryData(drawingKeys.detail(drawingId), drawing),
    onSettled: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: drawingKeys.job(jobId) }),
        queryClient.invalidateQueries({
          queryKey: drawingKeys.detail(drawingId),
        }),
      ]),
  });
}
