import { hostname } from "node:os";
import { randomBytes } from "node:crypto";
import { In, type DataSource } from "typeorm";
import type { Mailer } from "../mail/mailer";
import { OutboxMessage } from "./outbox.entity";

export interface OutboxWorkerOptions {
  ds: DataSource;
  /** Anything with the Mailer's `send` (nodemailer over SMTP in the app). */
  transport: Pick<Mailer, "send">;
  /** Written into `claimedBy`; must differ between workers. Default: host, pid and a random suffix. */
  workerId?: string;
  /** How long to wait between polls when the last one found less than a full batch. Default 1 s. */
  pollMs?: number;
  /** Rows claimed per poll, and sent at once. Default 10. */
  batchSize?: number;
  /** Attempts before a message is marked `failed`. Default 20 (about three hours of retries). */
  maxAttempts?: number;
  /** Milliseconds to wait before the next attempt, given the attempts made so far (≥ 1). */
  backoff?: (attempts: number) => number;
  /**
   * A `sending` claim older than this is taken back (its worker died). Default 5 min: longer than
   * a send can take with the mailer's timeouts, or a slow send would be duplicated.
   */
  leaseMs?: number;
  /** Where failures are reported. Default console.warn. */
  log?: (message: string) => void;
  /** Told of failed polls first: one that says the database is unreachable is not logged again. */
  database?: { lost(err: unknown): boolean };
}

/** 2^attempts seconds, capped at 15 minutes. */
export const defaultBackoff = (attempts: number) =>
  Math.min(2 ** attempts * 1000, 15 * 60_000);

/** nodemailer marks an SMTP 5xx reply `permanent` (with its `responseCode`). */
const isPermanent = (err: unknown) =>
  typeof err === "object" &&
  err !== null &&
  "responseCode" in err &&
  typeof err.responseCode === "number" &&
  err.responseCode >= 500 &&
  err.responseCode < 600;

const describe = (err: unknown) =>
  (err instanceof Error ? err.message : String(err)).slice(0, 2000);

/**
 * Sends what `enqueueMail` queued, at least once. A poll claims due rows in a short transaction
 * (`FOR UPDATE SKIP LOCKED`, so workers in several processes never claim the same row), marks
 * them `sending`, and sends each outside the transaction with its stored Message-ID. A failure
 * goes back to `pending` with backoff, or `failed` after `maxAttempts` (at once when the server's
 * reply is a permanent 5xx). A worker that dies between
 * sending and marking leaves a `sending` row whose lease runs out; the next poll anywhere takes it
 * back, so it is resent (same Message-ID) rather than lost.
 */
export class OutboxWorker {
  readonly workerId: string;
  private readonly ds: DataSource;
  private readonly transport: Pick<Mailer, "send">;
  private readonly pollMs: number;
  private readonly batchSize: number;
  private readonly maxAttempts: number;
  private readonly backoff: (attempts: number) => number;
  private readonly leaseMs: number;
  private readonly log: (message: string) => void;
  private readonly database: { lost(err: unknown): boolean } | null;
  private running = false;
  private loop: Promise<void> | null = null;
  private wakeUp: (() => void) | null = null;

  constructor(o: OutboxWorkerOptions) {
    this.ds = o.ds;
    this.transport = o.transport;
    this.workerId =
      o.workerId ??
      `${hostname()}:${process.pid}:${randomBytes(3).toString("hex")}`;
    this.pollMs = o.pollMs ?? 1000;
    this.batchSize = o.batchSize ?? 10;
    this.maxAttempts = o.maxAttempts ?? 20;
    this.backoff = o.backoff ?? defaultBackoff;
    this.leaseMs = o.leaseMs ?? 5 * 60_000;
    this.log = o.log ?? ((message) => console.warn(message));
    this.database = o.database ?? null;
  }

  /** Polls until `stop()`. */
  start(): void {
    if (this.running) return;
    this.running = true;
    this.loop = this.poll();
  }

  /** Stops polling; resolves once the batch in flight has been sent and marked. */
  async stop(): Promise<void> {
    this.running = false;
    this.wakeUp?.();
    await this.loop;
    this.loop = null;
  }

  /** Claims one batch and sends it. Returns how many were sent. */
  async runOnce(): Promise<number> {
    return (await this.batch()).sent;
  }

  private async poll(): Promise<void> {
    while (this.running) {
      let full = false;
      try {
        full = (await this.batch()).claimed === this.batchSize;
      } catch (err) {
        // While the database is gone every poll fails: the watch says so once per outage.
        if (!this.database?.lost(err))
          this.log(`[outbox] ${this.workerId}: poll failed: ${describe(err)}`);
      }
      if (full || !this.running) continue;
      await new Promise<void>((resolve) => {
        const t = setTimeout(resolve, this.pollMs);
        this.wakeUp = () => {
          clearTimeout(t);
          resolve();
        };
      });
      this.wakeUp = null;
    }
  }

  private async batch(): Promise<{ claimed: number; sent: number }> {
    const rows = await this.claim();
    // The batch goes at once (batchSize bounds the connections to the relay): each send is
    // mostly waiting on the network.
    // allSettled: stop() must not resolve while a send is still out.
    const results = await Promise.allSettled(rows.map((r) => this.deliver(r)));
    const broken = results.find((r) => r.status === "rejected");
    if (broken) throw broken.reason;
    return {
      claimed: rows.length,
      sent: results.filter((r) => r.status === "fulfilled" && r.value).length,
    };
  }

  /**
   * One short transaction: take back expired claims, then lock due rows no other worker holds
   * and mark them ours. READ COMMITTED, so the scan takes no gap locks that would hold up
   * `enqueueMail` inserts in the meantime.
   */
  private async claim(): Promise<OutboxMessage[]> {
    return this.ds.transaction("READ COMMITTED", async (m) => {
      const stale: { id: string }[] = await m.query(
        "SELECT id FROM outbox_messages WHERE state = 'sending' AND claimedAt < UTC_TIMESTAMP(3) - INTERVAL ? MICROSECOND FOR UPDATE SKIP LOCKED",
        [this.leaseMs * 1000],
      );
      if (stale.length) {
        // A lost claim counts as an attempt: a message that kills its worker must not loop forever.
        // MariaDB assigns left to right, so `state` is decided from the attempts before this one.
        await m.query(
          "UPDATE outbox_messages SET state = IF(attempts + 1 >= ?, 'failed', 'pending'), attempts = attempts + 1, lastError = CONCAT('Claim by ', claimedBy, ' expired before it was marked sent (it may have been delivered)'), lastAttemptAt = claimedAt, claimedBy = NULL, claimedAt = NULL, nextAttemptAt = UTC_TIMESTAMP(3) WHERE id IN (?)",
          [this.maxAttempts, stale.map((r) => r.id)],
        );
        this.log(
          `[outbox] ${this.workerId}: took back ${stale.length} expired claim(s); they are sent again`,
        );
      }
      const due: { id: string }[] = await m.query(
        // nextAttemptAt, not createdAt: the (state, nextAttemptAt) index then gives the order, so
        // LIMIT stops the scan and only the rows taken are locked. A new row's nextAttemptAt is
        // its enqueue time, so this is still oldest first.
        "SELECT id FROM outbox_messages WHERE state = 'pending' AND nextAttemptAt <= UTC_TIMESTAMP(3) ORDER BY nextAttemptAt LIMIT ? FOR UPDATE SKIP LOCKED",
        [this.batchSize],
      );
      if (!due.length) return [];
      const ids = due.map((r) => r.id);
      await m
        .createQueryBuilder()
        .update(OutboxMessage)
        .set({
          state: "sending",
          claimedBy: this.workerId,
          claimedAt: () => "UTC_TIMESTAMP(3)",
        })
        .where({ id: In(ids) })
        .execute();
      const rows = await m.findBy(OutboxMessage, { id: In(ids) });
      return ids.map((id) => rows.find((r) => r.id === id)!);
    });
  }

  /** Sends one claimed row; true when it went. */
  private async deliver(row: OutboxMessage): Promise<boolean> {
    try {
      await this.transport.send({
        to: row.to,
        subject: row.subject,
        text: row.text,
        html: row.html ?? undefined,
        messageId: row.messageId,
        icalEvent: row.calendar ?? undefined,
      });
    } catch (err) {
      await this.failed(row, err);
      return false;
    }
    // If this update is lost (crash, database gone), the lease brings the row back: a resend.
    await this.ds
      .createQueryBuilder()
      .update(OutboxMessage)
      .set({ state: "sent", sentAt: () => "UTC_TIMESTAMP(3)" })
      .where({ id: row.id })
      .execute();
    return true;
  }

  private async failed(row: OutboxMessage, err: unknown): Promise<void> {
    const attempts = row.attempts + 1;
    // A 5xx reply is a permanent refusal (RFC 5321 §4.2.1: "the same request … will fail
    // again"): retrying it for three hours only hides it from the workshop, so it fails now and
    // waits for someone to fix the address and send it again.
    const gaveUp = attempts >= this.maxAttempts || isPermanent(err);
    const delayUs = Math.max(0, Math.round(this.backoff(attempts) * 1000));
    await this.ds
      .createQueryBuilder()
      .update(OutboxMessage)
      .set({
        state: gaveUp ? "failed" : "pending",
        attempts,
        lastError: describe(err),
        lastAttemptAt: () => "UTC_TIMESTAMP(3)",
        claimedBy: null,
        claimedAt: null,
        nextAttemptAt: () => "UTC_TIMESTAMP(3) + INTERVAL :delayUs MICROSECOND",
      })
      .where({ id: row.id, state: "sending", claimedBy: this.workerId })
      .setParameters({ delayUs })
      .execute();
    this.log(
      `[outbox] ${this.workerId}: sending ${row.messageId} to ${row.to} failed (attempt ${attempts}${gaveUp ? ", giving up" : ""}): ${describe(err)}`,
    );
  }
}
