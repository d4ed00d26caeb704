import type { FieldValues, Path, UseFormSetError } from "react-hook-form";
import { errorMessage, isApiError } from "./api-client";

/**
 * Put the server's per-field messages (422/400 "validation") on the form's fields and
 * return the message for the form as a whole, or null when every message found a field.
 */
export function applyServerErrors<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  knownFields: readonly string[],
): string | null {
  if (isApiError(error) && error.fields) {
    const leftover: string[] = [];
    for (const [field, messages] of Object.entries(error.fields)) {
      const message = messages.join(" ");
      if (knownFields.includes(field))
        setError(field as Path<T>, { type: "server", message });
      else leftover.push(message);
    }
    if (leftover.length === 0) return null;
    return `${error.message} ${leftover.join(" ")}`.trim();
  }
  return errorMessage(error);
}
