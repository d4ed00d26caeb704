import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  SessionResponse,
  acceptInvitationBodySchema,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { applySession } from "./get-session";
import { authKeys } from "./keys";

/** Accepts an invitation as the signed-in account (an existing one: no password is set). */
export function acceptInvitation(
  body: z.input<typeof acceptInvitationBodySchema>,
): Promise<SessionResponse> {
  return api.post<SessionResponse>("/api/auth/accept-invitation", body);
}

export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptInvitation,
    onSuccess: (session, body) => {
      applySession(queryClient, session);
      queryClient.removeQueries({ queryKey: authKeys.token(body.token) });
    },
  });
}
