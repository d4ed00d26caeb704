import type { z } from "zod";
import type {
  createLinkBodySchema,
  ProgrammeEdit,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { useProgrammeMutation } from "./programme-mutation";

export type CreateLinkInput = z.output<typeof createLinkBodySchema>;

export function createLink(
  jobId: string,
  body: CreateLinkInput,
): Promise<ProgrammeEdit> {
  return api.post<ProgrammeEdit>(`${programmePath(jobId)}/links`, body);
}

export function useCreateLink(jobId: string) {
  return useProgrammeMutation(jobId, (body: CreateLinkInput) =>
    createLink(jobId, body),
  );
}
