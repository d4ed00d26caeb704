import type { z } from "zod";
import type {
  ProgrammeEdit,
  updateLinkBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { useProgrammeMutation } from "./programme-mutation";

export type UpdateLinkInput = z.output<typeof updateLinkBodySchema>;

export function updateLink(
  jobId: string,
  linkId: string,
  body: UpdateLinkInput,
): Promise<ProgrammeEdit> {
  return api.patch<ProgrammeEdit>(
    `${programmePath(jobId)}/links/${encodeURIComponent(linkId)}`,
    body,
  );
}

export function useUpdateLink(jobId: string) {
  return useProgrammeMutation(
    jobId,
    ({ linkId, body }: { linkId: string; body: UpdateLinkInput }) =>
      updateLink(jobId, linkId, body),
  );
}
