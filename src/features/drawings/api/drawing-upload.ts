import { useRef, useState } from "react";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { DrawingDetail } from "../../../../shared/schemas";
import { uploadWithProgress } from "../../../lib/upload";
import { drawingKeys } from "./keys";

export interface UploadVars {
  url: string;
  form: FormData;
}

/**
 * An upload (a new drawing or a new revision) with its progress, 0–1, kept in state so the form
 * can show a real progress bar. Every upload answers with the drawing; the job's list and the
 * drawing are refetched afterwards.
 */
export function useDrawingUpload(jobId: string) {
  const queryClient = useQueryClient();
  const [progress, setProgress] = useState<number | null>(null);
  const controller = useRef<AbortController | null>(null);
  const mutation = useMutation({
    mutationFn: ({ url, form }: UploadVars) => {
      controller.current = new AbortController();
      setProgress(0);
      return uploadWithProgress<DrawingDetail>(
        url,
        form,
        setProgress,
        controller.current.signal,
      );
    },
    onSuccess: (drawing) =>
      queryClient.setQueryData(drawingKeys.detail(drawing.id), drawing),
    onSettled: (drawing) =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: drawingKeys.job(jobId) }),
        drawing
          ? queryClient.invalidateQueries({
              queryKey: drawingKeys.detail(drawing.id),
            })
          : undefined,
      ]),
  });
  return {
    ...mutation,
    progress,
    /** Stops an upload under way (the server removes what it stored for it). */
    cancel: () => controller.current?.abort(),
    reset: () => {
      setProgress(null);
      mutation.reset();
    },
  };
}
