import { queryOptions, useQuery } from "@tanstack/react-query";
import type { DrawingDetail } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { drawingKeys } from "./keys";
import { drawingPath } from "./paths";

/** GET /drawings/:drawingId: revisions (newest first), linked tasks with readiness, what the viewer may do. */
export function getDrawing(
  drawingId: string,
  signal?: AbortSignal,
): Promise<DrawingDetail> {
  return api.get<DrawingDetail>(drawingPath(drawingId), signal);
}

export const drawingQueryOptions = (drawingId: string) =>
  queryOptions({
    queryKey: drawingKeys.detail(drawingId),
    queryFn: ({ signal }) => getDrawing(drawingId, signal),
  });

export function useDrawing(drawingId: string) {
  return useQuery(drawingQueryOptions(drawingId));
}
