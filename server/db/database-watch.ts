import type { DataSource } from "typeorm";

// What mysql2 (through TypeORM or express-mysql-session) reports when MariaDB cannot be reached
// or a connection to it died: the socket errors of connect(2)/send(2), mysql2's own protocol
// codes, and the server's "shutting down" / "too many connections" / "connection killed" errors.
const UNREACHABLE_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "EPIPE",
  "EHOSTUNREACH",
  "ENETUNREACH",
  "ENOTFOUND",
  "EAI_AGAIN",
  "PROTOCOL_CONNECTION_LOST",
  "PROTOCOL_SEQUENCE_TIMEOUT",
  "ER_SERVER_SHUTDOWN",
  "ER_CON_COUNT_ERROR",
  "ER_CONNECTION_KILLED",
]);

/** True when `err` (or what it wraps: TypeORM's driverError, a cause, an AggregateError) says the database cannot be reached. */
export function isDatabaseUnreachable(err: unknown, depth = 0): boolean {
  if (typeof err !== "object" || err === null || depth > 4) return false;
  const e = err as {
    code?: unknown;
    driverError?: unknown;
    cause?: unknown;
    errors?: unknown;
  };
  if (typeof e.code === "string" && UNREACHABLE_CODES.has(e.code)) return true;
  if (e.driverError && isDatabaseUnreachable(e.driverError, depth + 1))
    return true;
  if (e.cause && isDatabaseUnreachable(e.cause, depth + 1)) return true;
  return (
    Array.isArray(e.errors) &&
    e.errors.some((x) => isDatabaseUnreachable(x, depth + 1))
  );
}

const message = (err: unknown) =>
  err instanceof Error ? err.message : String(err);

export interface DatabaseWatchOptions {
  ds: DataSource;
  /** Where the two lines of an outage go. Default console.warn. */
  log?: (message: string) => void;
  /** How often the database is tried while it is gone. Default 2 s. */
  probeMs?: number;
}

/**
 * One record of whether the database answers, so an outage is one line when it starts and one
 * when it ends, instead of a stack trace from every request and every poller (issue 13: a 10 s
 * outage wrote 4,768). Callers hand it the errors they catch (`lost`); while the database is gone
 * it tries `SELECT 1` every `probeMs` and says when it is back.
 */
export class DatabaseWatch {
  private readonly ds: DataSource;
  private readonly log: (message: string) => void;
  private readonly probeMs: number;
  private downSince: number | null = null;
  private probe: NodeJS.Timeout | null = null;

  constructor(o: DatabaseWatchOptions) {
    this.ds = o.ds;
    this.log = o.log ?? ((m) => console.warn(`[sitecue] ${m}`));
    this.probeMs = o.probeMs ?? 2000;
  }

  /** Whether the database is known to be gone. */
  get down(): boolean {
    return this.downSince !== null;
  }

  /**
   * Takes an error from anything that used the database: true when it says the database is
   * unreachable (then it is recorded, logged once per outage, and the caller should not log it).
   */
  lost(err: unknown): boolean {
    if (!isDatabaseUnreachable(err)) return false;
    this.markDown(err);
    return true;
  }

  /** The database failed a plain `SELECT 1`: it is down, whatever the error says. */
  markDown(err: unknown): void {
    if (this.downSince !== null) return;
    this.downSince = Date.now();
    this.log(
      `The database is not answering (${message(err)}); requests that need it get 503 until it is back`,
    );
    this.probe = setInterval(() => {
      this.ds
        .query("SELECT 1")
        .then(() => this.markUp())
        .catch(() => {});
    }, this.probeMs);
    this.probe.unref();
  }

  /** The database answered. */
  markUp(): void {
    if (this.downSince === null) return;
    const seconds = Math.round((Date.now() - this.downSince) / 1000);
    this.downSince = null;
    this.stopProbe();
    this.log(`The database is back (it was gone for ${seconds} s)`);
  }

  /** Stops the probe (at shut-down). */
  close(): void {
    this.stopProbe();
  }

  private stopProbe() {
    if (this.probe) clearInterval(this.probe);
    this.probe = null;
  }
}
