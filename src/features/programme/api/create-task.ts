import type { z } from "zod";
import type {
  createTaskBodySchema,
  ProgrammeResponse,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { useProgrammeMutation } from "./programme-mutation";

export type CreateTaskInput = z.output<typeof createTaskBodySchema>;
export interface CreateTaskAnswer {
  taskId: string;
  programme: ProgrammeResponse;
}

export function createTask(
  jobId: string,
  body: CreateTaskInput,
): Promise<CreateTaskAnswer> {
  return api.post<CreateTaskAnswer>(`${programmePath(jobId)}/tasks`, body);
}

export function useCreateTask(jobId: string) {
  return useProgrammeMutation(
    jobId,
    (body: CreateTaskInput) => createTask(jobId, body),
    (a) => a.programme,
  );
}
