import type { z } from "zod";
import type {
  applyResponseSchema,
  changeBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { useProgrammeMutation } from "./programme-mutation";

export type ChangeInput = z.output<typeof changeBodySchema>;
export type ApplyAnswer = z.output<typeof applyResponseSchema>;

/** Apply a move or a new duration; the server recomputes the knock-on and answers with it. */
export function applyChange(
  jobId: string,
  body: ChangeInput,
): Promise<ApplyAnswer> {
  return api.post<ApplyAnswer>(`${programmePath(jobId)}/programme/apply`, body);
}

export function useApplyChange(jobId: string) {
  return useProgrammeMutation(jobId, (body: ChangeInput) =>
    applyChange(jobId, body),
  );
}
