import type { ProgrammeEdit } from "../../../../shared/schemas";
import { apiRequest } from "../../../lib/api-client";
import { programmePath } from "./get-programme";
import { useProgrammeMutation } from "./programme-mutation";

export function deleteLink(
  jobId: string,
  linkId: string,
  version: number,
): Promise<ProgrammeEdit> {
  return apiRequest<ProgrammeEdit>(
    `${programmePath(jobId)}/links/${encodeURIComponent(linkId)}?version=${version}`,
    { method: "DELETE" },
  );
}

export function useDeleteLink(jobId: string) {
  return useProgrammeMutation(
    jobId,
    ({ linkId, version }: { linkId: string; version: number }) =>
      deleteLink(jobId, linkId, version),
  );
}
