import type { z } from "zod";
import type {
  ProgrammeEdit,
  progressBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { useProgrammeMutation } from "./programme-mutation";

export type ProgressInput = z.output<typeof progressBodySchema>;

export function recordProgress(
  jobId: string,
  taskId: string,
  body: ProgressInput,
): Promise<ProgrammeEdit> {
  return api.post<ProgrammeEdit>(
    `${programmePath(jobId)}/tasks/${encodeURIComponent(taskId)}/progress`,
    body,
  );
}

export function useRecordProgress(jobId: string) {
  return useProgrammeMutation(
    jobId,
    ({ taskId, body }: { taskId: string; body: ProgressInput }) =>
      recordProgress(jobId, taskId, body),
  );
}
