import { createHash } from "node:crypto";
import type { Request, Response } from "express";
import { RateLimiterRes } from "rate-limiter-flexible";
import { clientAddress, refusal, type LimitStore } from "../../http/rate-limit";

export interface SignInLimitOptions {
  /** Failed sign-ins per account (e-mail address) per window, from any number of addresses. */
  accountLimit: number;
  /** Failed sign-ins per client address per window, at any accounts: much higher (shared Wi-Fi). */
  addressLimit: number;
  windowMs: number;
}

/**
 * Sign-in limits (OWASP ASVS v4.0.3 2.2.1; Authentication Cheat Sheet "Protect against automated
 * attacks"): counted per account across addresses, so spreading guesses over many addresses does
 * not help, and per address with a high limit, so one person's typos do not lock out the rest of a
 * workshop's shared connection. Both counts are in MariaDB, shared by every app process.
 *
 * Every attempt is counted before the password is checked (so a burst in parallel cannot slip
 * past the limit); a right password takes its point back, so only failures (and refused
 * attempts) count. Returns the function that takes the point back.
 */
export function signInLimits(store: LimitStore, opts: SignInLimitOptions) {
  const accounts = store.limiter({
    name: "sign-in-account",
    limit: opts.accountLimit,
    windowMs: opts.windowMs,
  });
  const addresses = store.limiter({
    name: "sign-in-address",
    limit: opts.addressLimit,
    windowMs: opts.windowMs,
  });
  return async function countAttempt(
    req: Request,
    res: Response,
    email: string,
  ): Promise<() => Promise<void>> {
    // The account key is a hash: the table holds no e-mail address, known or unknown.
    const account = createHash("sha256").update(email).digest("hex");
    const address = clientAddress(req);
    const [byAddress, byAccount] = await Promise.allSettled([
      addresses.consume(address),
      accounts.consume(account),
    ]);
    const checks = [
      [byAddress, "Too many sign-in attempts from this network."],
      [byAccount, "Too many sign-in attempts for this account."],
    ] as const;
    for (const [result, message] of checks) {
      if (result.status === "fulfilled") continue;
      if (!(result.reason instanceof RateLimiterRes)) throw result.reason;
      throw refusal(res, result.reason.msBeforeNext, message);
    }
    return async () => {
      await Promise.all([addresses.reward(address), accounts.reward(account)]);
    };
  };
}
