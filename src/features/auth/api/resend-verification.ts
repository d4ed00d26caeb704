import { useMutation } from "@tanstack/react-query";
import type { VerifyEmailResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";

/** E-mails the signed-in person a new address-check link. */
export function resendVerification(): Promise<VerifyEmailResponse> {
  return api.post<VerifyEmailResponse>("/api/auth/verify-email/resend");
}

export function useResendVerification() {
  return useMutation({ mutationFn: resendVerification });
}
