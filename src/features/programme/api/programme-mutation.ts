import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { ProgrammeEdit } from "../../../../shared/schemas";
import { takeProgrammeEdit } from "../../../lib/programme-edit";
import { getProgramme } from "./get-programme";
import { programmeKeys } from "./keys";

/**
 * Every programme edit answers with what changed (the server's answer, never the client's
 * preview): lay it over the cached programme, or read the programme again when someone else
 * changed it meanwhile. The mutation resolves once the cache holds the new version, so an Undo
 * offered next sends that version. A 409 is left to the screen, which shows who changed what and
 * offers the reload.
 */
export function useProgrammeMutation<TBody, TAnswer extends ProgrammeEdit>(
  jobId: string,
  mutationFn: (body: TBody) => Promise<TAnswer>,
) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: async (answer) => {
      await takeProgrammeEdit(
        queryClient,
        {
          queryKey: programmeKeys.detail(jobId),
          queryFn: () => getProgramme(jobId),
        },
        answer,
      );
    },
  });
}
