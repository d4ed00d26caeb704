import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { ProgrammeResponse } from "../../../../shared/schemas";
import { programmeKeys } from "./keys";

/**
 * Every programme edit answers with the whole recomputed programme: put it straight into the
 * cache (the server's answer, never the client's preview). A 409 is left to the screen, which
 * shows who changed what and offers the reload.
 */
export function useProgrammeMutation<TBody, TAnswer>(
  jobId: string,
  mutationFn: (body: TBody) => Promise<TAnswer>,
  programmeOf: (answer: TAnswer) => ProgrammeResponse,
) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: (answer) => {
      queryClient.setQueryData(
        programmeKeys.detail(jobId),
        programmeOf(answer),
      );
    },
  });
}

export const itself = (p: ProgrammeResponse) => p;
