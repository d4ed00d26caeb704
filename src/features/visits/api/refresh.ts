import { useQueryClient } from "@tanstack/react-query";
import { visitKeys } from "./keys";

/** Every action changes the visit and may change others (a confirmation, a moved booking): refresh all. */
export function useRefreshVisits() {
  const queryClient = useQueryClient();
  return () => queryClient.invalidateQueries({ queryKey: visitKeys.all });
}
