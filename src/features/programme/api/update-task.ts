import type { z } from "zod";
import type {
  ProgrammeEdit,
  updateTaskBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { useProgrammeMutation } from "./programme-mutation";

export type UpdateTaskInput = z.output<typeof updateTaskBodySchema>;

export function updateTask(
  jobId: string,
  taskId: string,
  body: UpdateTaskInput,
): Promise<ProgrammeEdit> {
  return api.patch<ProgrammeEdit>(
    `${programmePath(jobId)}/tasks/${encodeURIComponent(taskId)}`,
    body,
  );
}

export function useUpdateTask(jobId: string) {
  return useProgrammeMutation(
    jobId,
    ({ taskId, body }: { taskId: string; body: UpdateTaskInput }) =>
      updateTask(jobId, taskId, body),
  );
}
