import session from "express-session";
import MySQLStoreFactory from "express-mysql-session";
import type { DbSettings } from "../db/data-source";
import { countStatement } from "../db/query-tally";

/** A signed-in session's expiry moves forward at most this often (one UPDATE per minute). */
export const TOUCH_EVERY_MS = 60_000;

export const SESSION_MAX_AGE_MS = 14 * 24 * 3600 * 1000;

type Callback = (err?: unknown) => void;

/**
 * The sessions table's store (express-mysql-session), with two changes:
 * - `touch` (which express-session calls on every request that did not change the session, to
 *   move its expiry) writes at most once a minute per session in this process; the cookie still
 *   rolls on each response, and the row's expiry lags it by under a minute of its 14 days;
 * - each of the store's reads and writes counts as a statement of the request (query-tally.ts).
 */
export function createSessionStore(
  db: DbSettings,
  opts: { now?: () => number } = {},
): session.Store & { close(): Promise<void> } {
  const now = opts.now ?? Date.now;
  const MySQLStore = MySQLStoreFactory(session as never);
  const store = new MySQLStore({
    host: db.host,
    port: db.port,
    user: db.user,
    password: db.password,
    database: db.database,
    createDatabaseTable: false, // made by the migration
    clearExpired: true,
    checkExpirationInterval: 15 * 60 * 1000,
    expiration: SESSION_MAX_AGE_MS,
  });
  /** When this process last wrote each session's expiry (entries older than a minute are dropped). */
  const written = new Map<string, number>();
  const remember = (sid: string) => {
    const t = now();
    written.set(sid, t);
    if (written.size > 1000)
      for (const [k, at] of written)
        if (t - at >= TOUCH_EVERY_MS) written.delete(k);
  };

  // express-session calls these with a callback; the typings' promise overloads do not apply.
  type Method = (...args: unknown[]) => unknown;
  const methods = store as unknown as Record<
    "get" | "set" | "destroy" | "touch",
    Method
  >;
  const { get, set, destroy, touch } = Object.fromEntries(
    (["get", "set", "destroy", "touch"] as const).map((k) => [
      k,
      methods[k].bind(store),
    ]),
  ) as Record<"get" | "set" | "destroy" | "touch", Method>;
  methods.get = (sid, cb) => {
    countStatement();
    return get(sid, cb);
  };
  methods.set = (sid, data, cb) => {
    countStatement();
    remember(sid as string);
    return set(sid, data, cb);
  };
  methods.destroy = (sid, cb) => {
    countStatement();
    written.delete(sid as string);
    return destroy(sid, cb);
  };
  methods.touch = (sid, data, cb) => {
    const last = written.get(sid as string);
    if (last !== undefined && now() - last < TOUCH_EVERY_MS) {
      (cb as Callback | undefined)?.();
      return;
    }
    countStatement();
    remember(sid as string);
    return touch(sid, data, cb);
  };
  return store as unknown as session.Store & { close(): Promise<void> };
}
