import mysql from "mysql2";
import type { Request, RequestHandler, Response } from "express";
import { RateLimiterMySQL, RateLimiterRes } from "rate-limiter-flexible";
import type { DbSettings } from "../db/data-source";
import { HttpError } from "./errors";

/** One named counter: `limit` points per key per fixed window. */
export type Limiter = RateLimiterMySQL;

/**
 * Rate-limit counters in MariaDB (`rate_limits`, made by a migration), so every app process
 * counts against the same numbers (see DEVELOPERS.md "Rate limits are shared").
 */
export interface LimitStore {
  limiter(opts: { name: string; limit: number; windowMs: number }): Limiter;
  close(): Promise<void>;
}

/** A small pool of its own (as the session store has), used only by rate-limiter-flexible. */
export function createLimitStore(db: DbSettings): LimitStore {
  const pool = mysql.createPool({
    host: db.host,
    port: db.port,
    user: db.user,
    password: db.password,
    database: db.database,
    connectionLimit: 4,
  });
  return {
    limiter: ({ name, limit, windowMs }) =>
      new RateLimiterMySQL({
        storeClient: pool,
        storeType: "pool",
        dbName: db.database,
        tableName: "rate_limits",
        tableCreated: true,
        keyPrefix: name,
        points: limit,
        duration: windowMs / 1000,
      }),
    close: () => new Promise<void>((resolve) => pool.end(() => resolve())),
  };
}

/** The client address a limit counts by (X-Forwarded-For only when trust proxy is set). */
export const clientAddress = (req: Request): string =>
  req.ip ?? req.socket.remoteAddress ?? "unknown";

/** "in 1 minute" / "in 14 minutes": when a refused person may try again. */
export function tryAgainIn(ms: number): string {
  const minutes = Math.max(1, Math.ceil(ms / 60_000));
  return `Try again in ${minutes} minute${minutes === 1 ? "" : "s"}.`;
}

/**
 * Counts one point against `key`; resolves when under the limit. Over it, sets Retry-After
 * (delay-seconds, RFC 9110 §10.2.3) and throws a 429 (RFC 6585 §4) whose message ends with
 * when to try again. Store errors pass through as they are.
 */
export async function consumeOrRefuse(
  limiter: Limiter,
  key: string,
  res: Response,
  message: string,
): Promise<void> {
  try {
    await limiter.consume(key);
  } catch (e) {
    if (!(e instanceof RateLimiterRes)) throw e;
    throw refusal(res, e.msBeforeNext, message);
  }
}

/** The 429 for a limit that has `msBeforeNext` left to run (Retry-After set on `res`). */
export function refusal(
  res: Response,
  msBeforeNext: number,
  message: string,
): HttpError {
  res.set("Retry-After", String(Math.max(1, Math.ceil(msBeforeNext / 1000))));
  return new HttpError(
    429,
    "rate-limited",
    `${message} ${tryAgainIn(msBeforeNext)}`,
  );
}

/** A per-address request limit (every request counts), answering 429 in the API's error shape. */
export function limitRequests(
  store: LimitStore,
  opts: { name: string; limit: number; windowMs: number; message: string },
): RequestHandler {
  const limiter = store.limiter(opts);
  return (req, res, next) => {
    consumeOrRefuse(limiter, clientAddress(req), res, opts.message).then(
      () => next(),
      next,
    );
  };
}
