import { randomBytes, timingSafeEqual } from "node:crypto";
import type { Request, RequestHandler, Response } from "express";
import { HttpError } from "./errors";

const SAFE = new Set(["GET", "HEAD", "OPTIONS"]);

/** The signed cookie holding an anonymous visitor's token (no session row is stored for them). */
export const ANONYMOUS_CSRF_COOKIE = "sitecue.csrf";

const newToken = () => randomBytes(32).toString("base64url");

/** The anonymous visitor's token from its signed cookie, if it carries a valid one. */
function anonymousToken(req: Request): string | null {
  const value: unknown = req.signedCookies?.[ANONYMOUS_CSRF_COOKIE];
  return typeof value === "string" && value.length > 0 ? value : null;
}

/** A session is in use once someone signs in; until then the visitor has only the cookie. */
const hasSession = (req: Request) =>
  Boolean(req.user || req.session?.csrfToken);

/**
 * The token a page must echo in `X-CSRF-Token`. Signed in: the session's synchronizer token,
 * made on first use. Anonymous: a signed double-submit cookie (OWASP CSRF Prevention Cheat Sheet
 * "Signed Double-Submit Cookie"), so a visitor who only looks stores no 14-day session row.
 */
export function csrfTokenFor(req: Request, res: Response): string {
  if (hasSession(req)) {
    req.session.csrfToken ??= newToken();
    return req.session.csrfToken;
  }
  const existing = anonymousToken(req);
  if (existing) return existing;
  const token = newToken();
  res.cookie(ANONYMOUS_CSRF_COOKIE, token, {
    signed: true,
    httpOnly: true,
    sameSite: "lax",
    secure: req.secure,
    path: "/api",
  });
  return token;
}

const same = (sent: string, expected: string | null | undefined) =>
  !!expected &&
  sent.length === expected.length &&
  timingSafeEqual(Buffer.from(sent), Buffer.from(expected));

/**
 * CSRF protection (OWASP CSRF Prevention Cheat Sheet): every state-changing request must echo
 * the session's synchronizer token in `X-CSRF-Token` — or, for a visitor without a session, the
 * token in their signed cookie. SameSite=Lax cookies are a second layer.
 */
export const csrfProtection: RequestHandler = (req, _res, next) => {
  if (SAFE.has(req.method)) return next();
  const sent = req.get("x-csrf-token") ?? "";
  const expected = hasSession(req)
    ? req.session.csrfToken
    : anonymousToken(req);
  if (!same(sent, expected))
    return next(
      new HttpError(
        403,
        "csrf",
        "This form has expired. Reload the page and try again.",
      ),
    );
  next();
};
