import type { z } from "zod";
import type {
  ProgrammeEdit,
  reorderBodySchema,
} from "../../../../shared/schemas";
import { apiRequest } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { useProgrammeMutation } from "./programme-mutation";

export type ReorderInput = z.output<typeof reorderBodySchema>;

export function reorderTasks(
  jobId: string,
  body: ReorderInput,
): Promise<ProgrammeEdit> {
  return apiRequest<ProgrammeEdit>(`${programmePath(jobId)}/tasks/order`, {
    method: "PUT",
    body,
  });
}

export function useReorderTasks(jobId: string) {
  return useProgrammeMutation(jobId, (body: ReorderInput) =>
    reorderTasks(jobId, body),
  );
}
