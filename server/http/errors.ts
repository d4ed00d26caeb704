import type { ErrorRequestHandler, RequestHandler } from "express";
import { ZodError } from "zod";

/** Stable error codes the client can switch on. */
export type ErrorCode =
  | "validation"
  | "unauthenticated"
  | "invalid-credentials"
  | "forbidden"
  | "csrf"
  | "not-found"
  | "token-invalid"
  | "version-conflict"
  | "conflict"
  | "gone"
  | "busy"
  | "too-large"
  | "file-too-large"
  | "file-type-refused"
  | "file-missing"
  | "too-many-files"
  | "upload-incomplete"
  | "upload-malformed"
  | "rate-limited"
  | "unprocessable"
  | "unavailable"
  // Issue 14: an owner who has not used their sign-up link yet may not make Sitecue e-mail anyone.
  | "email-unverified"
  | "internal";

/** A typed error thrown anywhere in a request; mapped once to `{ error: { code, message, fields? } }`. */
export class HttpError extends Error {
  constructor(
    public readonly status: number,
    public readonly code: ErrorCode,
    message: string,
    public readonly fields?: Record<string, string[]>,
  ) {
    super(message);
  }
}

export const notFound = (what = "That record") =>
  new HttpError(404, "not-found", `${what} was not found.`);
export const forbidden = (message = "You do not have permission to do that.") =>
  new HttpError(403, "forbidden", message);
// MariaDB's answers when a row lock could not be had: ER_LOCK_WAIT_TIMEOUT (1205, also what
// `FOR UPDATE WAIT n` gives after n seconds), ER_LOCK_DEADLOCK (1213, this transaction was the
// deadlock's victim) and ER_LOCK_NOWAIT (3572). The transaction has been rolled back, so nothing
// was saved: the person can simply try again (issue 13, item 2; locking rule in DEVELOPERS.md).
const LOCK_ERRNOS = new Set([1205, 1213, 3572]);

/** True when a database error means another request holds the rows this one needed. */
export function isLockRefusal(err: unknown): boolean {
  const e = err as { errno?: unknown; driverError?: { errno?: unknown } };
  const errno = e?.errno ?? e?.driverError?.errno;
  return typeof errno === "number" && LOCK_ERRNOS.has(errno);
}

/** The 409 for a request that could not get a lock in time (see isLockRefusal). */
export const busy = () =>
  new HttpError(
    409,
    "busy",
    "Someone else is saving a change to this job right now; try again.",
  );

export const unauthenticated = () =>
  new HttpError(401, "unauthenticated", "Please sign in first.");

/** Turns zod issues into a field → messages map (path joined with dots; "" for the whole body). */
export function zodFields(err: ZodError): Record<string, string[]> {
  const fields: Record<string, string[]> = {};
  for (const issue of err.issues) {
    const key = issue.path.join(".") || "_";
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

export const notFoundRoute: RequestHandler = (req, _res, next) => {
  next(
    new HttpError(
      404,
      "not-found",
      `No API route for ${req.method} ${req.path}.`,
    ),
  );
};

/**
 * The one error handler: known errors keep their status; the database being unreachable is a 503
 * (reported to `opts.database`, which logs an outage once); anything else is a 500 without a stack.
 */
export function errorHandler(
  log: (err: unknown) => void,
  opts: { database?: { lost(err: unknown): boolean } } = {},
): ErrorRequestHandler {
  return (err, _req, res, _next) => {
    if (res.headersSent) return;
    if (err instanceof HttpError) {
      res.status(err.status).json({
        error: {
          code: err.code,
          message: err.message,
          ...(err.fields ? { fields: err.fields } : {}),
        },
      });
      return;
    }
    if (isLockRefusal(err)) {
      const b = busy();
      res
        .status(b.status)
        .json({ error: { code: b.code, message: b.message } });
      return;
    }
    if (err instanceof ZodError) {
      res.status(400).json({
        error: {
          code: "validation",
          message: "Some fields need attention.",
          fields: zodFields(err),
        },
      });
      return;
    }
    // body-parser / multer errors carry a status and a type.
    const e = err as {
      status?: number;
      type?: string;
      code?: string;
      message?: string;
    };
    if (e?.type === "entity.too.large" || e?.code === "LIMIT_FILE_SIZE") {
      res.status(413).json({
        error: { code: "too-large", message: "That request is too large." },
      });
      return;
    }
    if (e?.type === "entity.parse.failed") {
      res.status(400).json({
        error: {
          code: "validation",
          message: "The request body is not valid JSON.",
        },
      });
      return;
    }
    if (typeof e?.status === "number" && e.status >= 400 && e.status < 500) {
      res.status(e.status).json({
        error: {
          code: "validation",
          message: "The request could not be read.",
        },
      });
      return;
    }
    if (opts.database?.lost(err)) {
      // RFC 9110 §15.6.4: 503 is a temporary overload or outage; Retry-After (§10.2.3) says when.
      res.setHeader("Retry-After", "10");
      res.status(503).json({
        error: {
          code: "unavailable",
          message:
            "Sitecue cannot reach its database just now. Please try again in a minute.",
        },
      });
      return;
    }
    log(err);
    res.status(500).json({
      error: {
        code: "internal",
        message: "Something went wrong on our side. Please try again.",
      },
    });
  };
}
