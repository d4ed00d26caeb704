import type { ProgrammeResponse } from "../../../../shared/schemas";
import { apiRequest } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { itself, useProgrammeMutation } from "./programme-mutation";

export function deleteTask(
  jobId: string,
  taskId: string,
  version: number,
): Promise<ProgrammeResponse> {
  return apiRequest<ProgrammeResponse>(
    `${programmePath(jobId)}/tasks/${encodeURIComponent(taskId)}?version=${version}`,
    { method: "DELETE" },
  );
}

export function useDeleteTask(jobId: string) {
  return useProgrammeMutation(
    jobId,
    ({ taskId, version }: { taskId: string; version: number }) =>
      deleteTask(jobId, taskId, version),
    itself,
  );
}
