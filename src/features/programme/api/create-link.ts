import type { z } from "zod";
import type {
  createLinkBodySchema,
  ProgrammeResponse,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { itself, useProgrammeMutation } from "./programme-mutation";

export type CreateLinkInput = z.output<typeof createLinkBodySchema>;

export function createLink(
  jobId: string,
  body: CreateLinkInput,
): Promise<ProgrammeResponse> {
  return api.post<ProgrammeResponse>(`${programmePath(jobId)}/links`, body);
}

export function useCreateLink(jobId: string) {
  return useProgrammeMutation(
    jobId,
    (body: CreateLinkInput) => createLink(jobId, body),
    itself,
  );
}
