// Every programme edit answers with what changed (issue 15); this puts it into a cached
// programme so the screens update at once, and reads the programme afresh when the answer is
// not the next version of the cached one (someone else changed it meanwhile).
import type { QueryClient, QueryKey } from "@tanstack/react-query";
import {
  programmeAfterEdit,
  type ProgrammeEdit,
  type ProgrammeResponse,
} from "../../shared/schemas";

/** The cached programme after `edit`: merged when it is the next version, else fetched again. */
export async function takeProgrammeEdit(
  queryClient: QueryClient,
  query: {
    queryKey: QueryKey;
    queryFn: () => Promise<ProgrammeResponse>;
  },
  edit: ProgrammeEdit,
): Promise<ProgrammeResponse> {
  const next = programmeAfterEdit(
    queryClient.getQueryData<ProgrammeResponse>(query.queryKey),
    edit,
  );
  if (next) {
    queryClient.setQueryData(query.queryKey, next);
    return next;
  }
  // staleTime 0: always a new request, shared with any fetch already on its way.
  return queryClient.fetchQuery({
    queryKey: query.queryKey,
    queryFn: query.queryFn,
    staleTime: 0,
  });
}
