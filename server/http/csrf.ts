import { randomBytes, timingSafeEqual } from "node:crypto";
import type { Request, RequestHandler } from "express";
import { HttpError } from "./errors";

const SAFE = new Set(["GET", "HEAD", "OPTIONS"]);

/** The session's synchronizer token, made on first use. */
export function csrfTokenFor(req: Request): string {
  req.session.csrfToken ??= randomBytes(32).toString("base64url");
  return req.session.csrfToken;
}

/**
 * Synchronizer-token CSRF protection (OWASP CSRF Prevention Cheat Sheet): every state-changing
 * request must echo the session's token in `X-CSRF-Token`. SameSite=Lax cookies are a second layer.
 */
export const csrfProtection: RequestHandler = (req, _res, next) => {
  if (SAFE.has(req.method)) return next();
  const sent = req.get("x-csrf-token") ?? "";
  const expected = req.session?.csrfToken ?? "";
  const ok =
    expected.length > 0 &&
    sent.length === expected.length &&
    timingSafeEqual(Buffer.from(sent), Buffer.from(expected));
  if (!ok)
    return next(
      new HttpError(
        403,
        "csrf",
        "This form has expired. Reload the page and try again.",
      ),
    );
  next();
};
