import rateLimit from "express-rate-limit";
import type { RequestHandler } from "express";
import { HttpError } from "./errors";

/**
 * A per-address request limit answering 429 in the API's error shape. The store is this
 * process's memory: behind several app processes each has its own count (see DEVELOPERS.md).
 */
export function limitRequests(opts: {
  limit: number;
  windowMs: number;
  message: string;
  /** Count only failed requests (for sign-in: an office behind one address is not locked out). */
  onlyFailures?: boolean;
}): RequestHandler {
  return rateLimit({
    windowMs: opts.windowMs,
    limit: opts.limit,
    skipSuccessfulRequests: opts.onlyFailures ?? false,
    standardHeaders: "draft-8",
    legacyHeaders: false,
    handler: (_req, _res, next) =>
      next(new HttpError(429, "rate-limited", opts.message)),
  });
}
