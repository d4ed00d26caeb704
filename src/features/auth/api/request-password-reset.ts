import { useMutation } from "@tanstack/react-query";
import type { z } from "zod";
import type { passwordResetBodySchema } from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";

export function requestPasswordReset(
  body: z.input<typeof passwordResetBodySchema>,
): Promise<{ ok: true }> {
  return api.post<{ ok: true }>("/api/auth/password-reset", body);
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}
