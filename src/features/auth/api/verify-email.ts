import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { VerifyEmailResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { authKeys } from "./keys";

/** Uses an address-check link once. */
export function verifyEmail(token: string): Promise<VerifyEmailResponse> {
  return api.post<VerifyEmailResponse>("/api/auth/verify-email", { token });
}

export function useVerifyEmail() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: verifyEmail,
    // The signed-in person (if it is them) is now verified: the banner goes.
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: authKeys.session() }),
  });
}
