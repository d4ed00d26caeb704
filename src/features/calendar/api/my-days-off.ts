import {
  queryOptions,
  useMutation,
  useQuery,
  useQueryClient,
} from "@tanstack/react-query";
import type { DaysOffBody, DaysOffResponse } from "../../../../shared/schemas";
import { api, apiRequest } from "../../../lib/api-client";
import { calendarKeys } from "./keys";

/** GET /api/me/days-off: a trade's days off, the same for every workshop. */
export const myDaysOffQueryOptions = () =>
  queryOptions({
    queryKey: calendarKeys.daysOff(),
    queryFn: ({ signal }) =>
      api.get<DaysOffResponse>("/api/me/days-off", signal),
  });

export function useMyDaysOff() {
  return useQuery(myDaysOffQueryOptions());
}

/** PUT /api/me/days-off: the whole list, entered once for all workshops. */
export function useSetMyDaysOff() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: DaysOffBody) =>
      apiRequest<DaysOffResponse>("/api/me/days-off", { method: "PUT", body }),
    onSuccess: (answer) => {
      queryClient.setQueryData(calendarKeys.daysOff(), answer);
      // The calendar marks them: read the days in view again.
      void queryClient.invalidateQueries({ queryKey: calendarKeys.ranges() });
    },
  });
}
