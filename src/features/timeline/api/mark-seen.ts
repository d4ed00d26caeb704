import { useMutation } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { timelinePaths } from "./paths";

/**
 * POST /api/jobs/:jobId/timeline/seen with the version the person was shown. The cached
 * timeline is left as it is: the highlights stay on screen until the next visit to the page.
 */
export function useMarkTimelineSeen(jobId: string) {
  return useMutation({
    mutationFn: (version: number) =>
      api.post<{ seenAt: string }>(timelinePaths.seen(jobId), { version }),
  });
}
