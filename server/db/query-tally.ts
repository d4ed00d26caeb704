import { AsyncLocalStorage } from "node:async_hooks";
import type { RequestHandler } from "express";
import onHeaders from "on-headers";

/**
 * Counts the SQL statements one request sends, so a route whose cost grows with the number of
 * jobs or bookings shows up in a test (issue 15). TypeORM's logger calls `countStatement` for every
 * query it runs (server/db/data-source.ts), and the session store for each of its own; the count
 * belongs to whichever request is running, carried by AsyncLocalStorage.
 */
export interface QueryTally {
  statements: number;
}

const current = new AsyncLocalStorage<QueryTally>();

/** One more statement for the request (or the `tallyQueries` call) that is running, if any. */
export function countStatement(): void {
  const tally = current.getStore();
  if (tally) tally.statements += 1;
}

/** Runs `fn` and says how many statements it sent (tests of services without HTTP). */
export async function tallyQueries<T>(
  fn: () => Promise<T>,
): Promise<{ result: T; statements: number }> {
  const tally: QueryTally = { statements: 0 };
  const result = await current.run(tally, fn);
  return { result, statements: tally.statements };
}

/** The response header carrying the count (W3C Server Timing: a metric with a description). */
export const SERVER_TIMING = "Server-Timing";

/** The statement count in a `Server-Timing` value written by `queryTally` (null when absent). */
export function statementsIn(header: string | undefined): number | null {
  const found = /(?:^|,)\s*db;[^,]*desc="(\d+) statements"/.exec(header ?? "");
  return found ? Number(found[1]) : null;
}

/**
 * Counts each request's statements and writes them as `Server-Timing: db;desc="N statements",
 * total;dur=…` (the time until the headers went out) when the headers go out. It must run before the session middleware, so the
 * session store's reads and writes count too.
 */
export const queryTally: RequestHandler = (_req, res, next) => {
  const tally: QueryTally = { statements: 0 };
  const started = performance.now();
  onHeaders(res, () => {
    const ms = (performance.now() - started).toFixed(1);
    res.appendHeader(
      SERVER_TIMING,
      `db;desc="${tally.statements} statements", total;dur=${ms}`,
    );
  });
  current.run(tally, next);
};
