import type { ProgrammeEdit } from "../../../../shared/schemas";
import { apiRequest } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { useProgrammeMutation } from "./programme-mutation";

export function deleteTask(
  jobId: string,
  taskId: string,
  version: number,
): Promise<ProgrammeEdit> {
  return apiRequest<ProgrammeEdit>(
    `${programmePath(jobId)}/tasks/${encodeURIComponent(taskId)}?version=${version}`,
    { method: "DELETE" },
  );
}

export function useDeleteTask(jobId: string) {
  return useProgrammeMutation(
    jobId,
    ({ taskId, version }: { taskId: string; version: number }) =>
      deleteTask(jobId, taskId, version),
  );
}
