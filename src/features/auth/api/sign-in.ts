import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { SessionResponse, SignInBody } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { applySession } from "./get-session";

export function signIn(body: SignInBody): Promise<SessionResponse> {
  return api.post<SessionResponse>("/api/auth/sign-in", body);
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (session) => applySession(queryClient, session),
  });
}
