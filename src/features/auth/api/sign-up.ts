import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { SessionResponse, SignUpBody } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { applySession } from "./get-session";

/** "Create your workshop": the server signs the new owner in and answers with the session. */
export function signUp(body: SignUpBody): Promise<SessionResponse> {
  return api.post<SessionResponse>("/api/auth/sign-up", body);
}

export function useSignUp() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signUp,
    onSuccess: (session) => applySession(queryClient, session),
  });
}
