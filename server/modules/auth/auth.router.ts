import type { Authenticator } from "passport";
import type { Request, Response } from "express";
import { limitRequests, type LimitStore } from "../../http/rate-limit";
import { z } from "zod";
import {
  acceptInvitationBodySchema,
  passwordResetBodySchema,
  sessionResponseSchema,
  setPasswordBodySchema,
  signInBodySchema,
  signUpBodySchema,
  tokenInfoResponseSchema,
  tokenParamsSchema,
  verifyEmailBodySchema,
  verifyEmailResponseSchema,
} from "../../../shared/schemas";
import { csrfTokenFor } from "../../http/csrf";
import { HttpError } from "../../http/errors";
import type { ApiRoutes } from "../../http/routes";
import { requireActor } from "../../policies";
import { loadSessionUser } from "../users/users.service";
import { signInLimits } from "./sign-in-limits";
import {
  acceptInvitation,
  requestPasswordReset,
  resendVerification,
  setPasswordWithToken,
  signUp,
  tokenInfo,
  verifyEmail,
  type AuthDeps,
} from "./auth.service";

export interface AuthRouteOptions {
  /** Failed sign-ins per account per window (counted across addresses); link use gets 3×. */
  signInLimit: number;
  /** Failed sign-ins per client address per window (any account). */
  signInAddressLimit: number;
  windowMs: number;
  /** The shared rate-limit counters (MariaDB). */
  limits: LimitStore;
}

const login = (req: Request, user: Express.User) =>
  new Promise<void>((resolve, reject) =>
    req.login(user, (err) => (err ? reject(err) : resolve())),
  );

const authenticateLocal = (
  passport: Pick<Authenticator, "authenticate">,
  req: Request,
  res: Response,
) =>
  new Promise<Express.User | false>((resolve, reject) =>
    passport.authenticate(
      "local",
      { session: false },
      (err: unknown, user: Express.User | false) =>
        err ? reject(err) : resolve(user),
    )(req, res, reject),
  );

/** Sign-in, sign-out, sign-up, the session, password reset, set-password-by-link, address checks. */
export function registerAuthRoutes(
  api: ApiRoutes,
  deps: AuthDeps,
  passport: Pick<Authenticator, "authenticate">,
  opts: AuthRouteOptions,
): void {
  const countSignIn = signInLimits(opts.limits, {
    accountLimit: opts.signInLimit,
    addressLimit: opts.signInAddressLimit,
    windowMs: opts.windowMs,
  });
  // Link use and reset requests have their own per-address budget, three times the sign-in one.
  const links = limitRequests(opts.limits, {
    name: "auth-links",
    windowMs: opts.windowMs,
    limit: opts.signInLimit * 3,
    message: "Too many attempts.",
  });
  // Sign-up and "send it again" each have a per-address budget the size of sign-in's: every
  // request counts, a duplicate address included (it says the address has an account).
  const signUps = limitRequests(opts.limits, {
    name: "sign-up",
    windowMs: opts.windowMs,
    limit: opts.signInLimit,
    message: "Too many workshops created from here.",
  });
  const resends = limitRequests(opts.limits, {
    name: "verify-resend",
    windowMs: opts.windowMs,
    limit: opts.signInLimit,
    message: "Too many links sent.",
  });
  const session = (req: Request, res: Response) => ({
    user: req.user?.user ?? null,
    csrfToken: csrfTokenFor(req, res),
  });

  api.add({
    method: "get",
    path: "/auth/session",
    tag: "auth",
    summary:
      "The signed-in person (or null) and the CSRF token for state-changing requests",
    response: sessionResponseSchema,
    handler: async ({ req, res }) => session(req, res),
  });

  api.add({
    method: "post",
    path: "/auth/sign-in",
    tag: "auth",
    summary: "Sign in with e-mail and password (the session id is renewed)",
    body: signInBodySchema,
    response: sessionResponseSchema,
    handler: async ({ req, res, body }) => {
      const succeeded = await countSignIn(req, res, body.email);
      const user = await authenticateLocal(passport, req, res);
      if (!user)
        throw new HttpError(
          401,
          "invalid-credentials",
          "That e-mail and password do not match an account.",
        );
      await succeeded();
      await login(req, user);
      return session(req, res);
    },
  });

  api.add({
    method: "post",
    path: "/auth/sign-out",
    tag: "auth",
    summary: "Sign out",
    response: sessionResponseSchema,
    handler: async ({ req, res }) => {
      await new Promise<void>((resolve, reject) =>
        req.logout((err) => (err ? reject(err) : resolve())),
      );
      // logout() regenerates the session, and express-session would store the new empty one
      // (the request came with a stored session); destroy it, so an anonymous visitor keeps no row.
      await new Promise<void>((resolve, reject) =>
        req.session.destroy((err) => (err ? reject(err) : resolve())),
      );
      return { user: null, csrfToken: csrfTokenFor(req, res) };
    },
  });

  api.add({
    method: "post",
    path: "/auth/password-reset",
    tag: "auth",
    summary:
      "E-mail a password-reset link (always answers 202, so accounts are not revealed)",
    before: [links],
    body: passwordResetBodySchema,
    status: 202,
    response: z.object({ ok: z.literal(true) }),
    handler: async ({ body }) => {
      await requestPasswordReset(deps, body.email);
      return { ok: true };
    },
  });

  api.add({
    method: "get",
    path: "/auth/tokens/:token",
    tag: "auth",
    summary: "What an invitation or reset link is for",
    before: [links],
    params: tokenParamsSchema,
    response: tokenInfoResponseSchema,
    handler: async ({ params }) => tokenInfo(deps.ds, params.token),
  });

  api.add({
    method: "post",
    path: "/auth/set-password",
    tag: "auth",
    summary:
      "Use an invitation or reset link once: set the password and sign in",
    before: [links],
    body: setPasswordBodySchema,
    response: sessionResponseSchema,
    handler: async ({ req, res, body }) => {
      const userId = await setPasswordWithToken(
        deps.ds,
        body.token,
        body.password,
      );
      const loaded = await loadSessionUser(deps.ds.manager, userId);
      if (!loaded)
        throw new HttpError(
          404,
          "token-invalid",
          "This link is no longer valid.",
        );
      // A fresh session id under the new generation: the others were ended with the old password.
      await login(req, loaded);
      return session(req, res);
    },
  });

  api.add({
    method: "post",
    path: "/auth/sign-up",
    tag: "auth",
    summary:
      "Create a workshop and its first owner, e-mail an address-check link, and sign in",
    before: [signUps],
    body: signUpBodySchema,
    status: 201,
    response: sessionResponseSchema,
    handler: async ({ req, res, body }) => {
      const userId = await signUp(deps, body);
      const loaded = await loadSessionUser(deps.ds.manager, userId);
      if (!loaded) throw new Error("the new account was not found");
      // A fresh session id, as at sign-in (a visitor's earlier session never carries over).
      await login(req, loaded);
      return session(req, res);
    },
  });

  api.add({
    method: "post",
    path: "/auth/verify-email",
    tag: "auth",
    summary: "Use an address-check link once: the address counts as verified",
    before: [links],
    body: verifyEmailBodySchema,
    response: verifyEmailResponseSchema,
    handler: async ({ body }) => {
      const { email } = await verifyEmail(deps.ds, body.token);
      return { email };
    },
  });

  api.add({
    method: "post",
    path: "/auth/verify-email/resend",
    tag: "auth",
    summary: "E-mail the signed-in person a new address-check link",
    before: [resends],
    response: verifyEmailResponseSchema,
    handler: async ({ actor }) => {
      requireActor(actor);
      return resendVerification(deps, actor.userId);
    },
  });

  api.add({
    method: "post",
    path: "/auth/accept-invitation",
    tag: "auth",
    summary:
      "Accept an invitation as the signed-in account it was sent to (the password and sessions stay)",
    before: [links],
    body: acceptInvitationBodySchema,
    response: sessionResponseSchema,
    handler: async ({ actor, req, res, body }) => {
      // Any signed-in person may try; the service checks the link is theirs (issue 14).
      requireActor(actor);
      await acceptInvitation(deps.ds, actor.userId, body.token);
      // The same session carries on; it now includes what the invitation granted.
      const loaded = await loadSessionUser(deps.ds.manager, actor.userId);
      return { user: loaded?.user ?? null, csrfToken: csrfTokenFor(req, res) };
    },
  });
}
