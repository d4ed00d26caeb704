import type { z } from "zod";
import type {
  ProgrammeResponse,
  updateTaskBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { itself, useProgrammeMutation } from "./programme-mutation";

export type UpdateTaskInput = z.output<typeof updateTaskBodySchema>;

export function updateTask(
  jobId: string,
  taskId: string,
  body: UpdateTaskInput,
): Promise<ProgrammeResponse> {
  return api.patch<ProgrammeResponse>(
    `${programmePath(jobId)}/tasks/${encodeURIComponent(taskId)}`,
    body,
  );
}

export function useUpdateTask(jobId: string) {
  return useProgrammeMutation(
    jobId,
    ({ taskId, body }: { taskId: string; body: UpdateTaskInput }) =>
      updateTask(jobId, taskId, body),
    itself,
  );
}
