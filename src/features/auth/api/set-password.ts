import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  SessionResponse,
  setPasswordBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { applySession } from "./get-session";
import { authKeys } from "./keys";

export function setPassword(
  body: z.input<typeof setPasswordBodySchema>,
): Promise<SessionResponse> {
  return api.post<SessionResponse>("/api/auth/set-password", body);
}

export function useSetPassword() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setPassword,
    onSuccess: (session, body) => {
      applySession(queryClient, session);
      // The token is single-use; forget what we knew about it.
      queryClient.removeQueries({ queryKey: authKeys.token(body.token) });
    },
  });
}
