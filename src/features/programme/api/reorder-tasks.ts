import type { z } from "zod";
import type {
  ProgrammeResponse,
  reorderBodySchema,
} from "../../../../shared/schemas";
import { apiRequest } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { itself, useProgrammeMutation } from "./programme-mutation";

export type ReorderInput = z.output<typeof reorderBodySchema>;

export function reorderTasks(
  jobId: string,
  body: ReorderInput,
): Promise<ProgrammeResponse> {
  return apiRequest<ProgrammeResponse>(`${programmePath(jobId)}/tasks/order`, {
    method: "PUT",
    body,
  });
}

export function useReorderTasks(jobId: string) {
  return useProgrammeMutation(
    jobId,
    (body: ReorderInput) => reorderTasks(jobId, body),
    itself,
  );
}
