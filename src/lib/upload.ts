import { ApiError, getCsrfToken } from "./api-client";

/**
 * Multipart upload with real upload progress. fetch() cannot report how much of a request body
 * has been sent, so this one call uses XMLHttpRequest (its `upload.onprogress`). It behaves like
 * the API client otherwise: session cookie, the CSRF token header, JSON answer, and any refusal
 * as the same typed ApiError (code, the server's message, fields).
 */
export function uploadWithProgress<T>(
  url: string,
  form: FormData,
  onProgress: (fraction: number) => void,
  signal?: AbortSignal,
): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    if (signal?.aborted) {
      reject(new DOMException("The upload was cancelled.", "AbortError"));
      return;
    }
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.withCredentials = true;
    xhr.responseType = "text";
    xhr.setRequestHeader("Accept", "application/json");
    const token = getCsrfToken();
    if (token) xhr.setRequestHeader("X-CSRF-Token", token);
    // No Content-Type: the browser writes multipart/form-data with its boundary.

    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable && event.total > 0)
        onProgress(Math.min(1, event.loaded / event.total));
    };
    // The body has left the browser; the server may still be storing it.
    xhr.upload.onload = () => onProgress(1);

    const onAbort = () => xhr.abort();
    signal?.addEventListener("abort", onAbort, { once: true });
    const done = () => signal?.removeEventListener("abort", onAbort);

    xhr.onabort = () => {
      done();
      reject(new DOMException("The upload was cancelled.", "AbortError"));
    };
    xhr.onerror = () => {
      done();
      reject(
        new ApiError(
          0,
          "network",
          "Sitecue could not reach the server. Check your connection and try again.",
        ),
      );
    };
    xhr.onload = () => {
      done();
      let body: unknown = undefined;
      if (xhr.responseText) {
        try {
          body = JSON.parse(xhr.responseText);
        } catch {
          body = undefined;
        }
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        if (xhr.status === 204) {
          resolve(undefined as T);
          return;
        }
        if (body === undefined) {
          reject(
            new ApiError(
              xhr.status,
              "bad-response",
              "The server sent an answer Sitecue could not read.",
            ),
          );
          return;
        }
        resolve(body as T);
        return;
      }
      const error = errorOf(body);
      if (error) {
        reject(
          new ApiError(xhr.status, error.code, error.message, error.fields),
        );
        return;
      }
      reject(
        new ApiError(
          xhr.status,
          xhr.status >= 500 ? "server-error" : "http-error",
          xhr.status === 413
            ? "The file is too large for the server."
            : xhr.status >= 500
              ? "Something went wrong on the server. Try again in a moment."
              : `The server answered ${xhr.status} ${xhr.statusText}.`,
        ),
      );
    };

    xhr.send(form);
  });
}

function errorOf(body: unknown):
  | {
      code: string;
      message: string;
      fields?: Record<string, string[]>;
    }
  | undefined {
  if (typeof body !== "object" || body === null || !("error" in body))
    return undefined;
  const error = (body as { error: unknown }).error;
  if (
    typeof error === "object" &&
    error !== null &&
    typeof (error as { code?: unknown }).code === "string" &&
    typeof (error as { message?: unknown }).message === "string"
  ) {
    return error as {
      code: string;
      message: string;
      fields?: Record<string, string[]>;
    };
  }
  return undefined;
}
