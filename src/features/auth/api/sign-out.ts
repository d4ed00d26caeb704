import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { SessionResponse } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { applySession } from "./get-session";

export function signOut(): Promise<SessionResponse> {
  return api.post<SessionResponse>("/api/auth/sign-out");
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: (session) => applySession(queryClient, session),
  });
}
