import type { z } from "zod";
import type {
  createTaskBodySchema,
  createTaskResponseSchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { useProgrammeMutation } from "./programme-mutation";

export type CreateTaskInput = z.output<typeof createTaskBodySchema>;
/** The new task's id and what changed. */
export type CreateTaskAnswer = z.output<typeof createTaskResponseSchema>;

export function createTask(
  jobId: string,
  body: CreateTaskInput,
): Promise<CreateTaskAnswer> {
  return api.post<CreateTaskAnswer>(`${programmePath(jobId)}/tasks`, body);
}

export function useCreateTask(jobId: string) {
  return useProgrammeMutation(jobId, (body: CreateTaskInput) =>
    createTask(jobId, body),
  );
}
