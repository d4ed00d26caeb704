import type { z } from "zod";
import { isApiError } from "../../../lib/api-client";

export type FieldErrors = Record<string, string | undefined>;

/** The first message for each field of a failed zod parse. */
export function zodFieldErrors(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = String(issue.path[0] ?? "form");
    out[key] ??= issue.message;
  }
  return out;
}

/** The server's per-field messages (400 validation), when it sent any. */
export function serverFieldErrors(error: unknown): FieldErrors {
  if (!isApiError(error) || !error.fields) return {};
  const out: FieldErrors = {};
  for (const [field, messages] of Object.entries(error.fields))
    out[field] = messages.join(" ");
  return out;
}
