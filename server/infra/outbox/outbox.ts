import { randomUUID } from "node:crypto";
import type { DataSource, EntityManager } from "typeorm";
import { newId } from "../../db/columns";
import { HttpError } from "../../http/errors";
import { OutboxMessage, type OutboxCalendar } from "./outbox.entity";

export { OutboxWorker, type OutboxWorkerOptions } from "./outbox-worker";

/** What a service hands to the outbox: one message to one address. */
export interface QueuedMail {
  to: string;
  subject: string;
  text: string;
  html?: string | null;
  /** An iCalendar part (RFC 6047), sent as nodemailer's `icalEvent`. */
  calendar?: OutboxCalendar | null;
  /**
   * The workshop the message is about; none for mail to a person about their own account
   * (reset, address check). A workshop's mail is refused until one of its owners has verified
   * their address (`assertWorkshopMaySend`), so every message about a workshop must name it.
   */
  workshopId?: string | null;
}

// The right-hand side only has to be unique to us (RFC 5322 §3.6.4); a UUID on the left does that.
const MESSAGE_ID_DOMAIN = "sitecue.example.test";

/**
 * Throws 403 `email-unverified` when no owner of the workshop has verified their e-mail address
 * (a workshop made by sign-up, until its link is used), so nothing it does e-mails anyone else
 * (issue 14: "until then the owner can look around but sends nothing to anyone"). Thrown inside
 * the caller's transaction, it rolls the whole change back: no booking marked sent without its
 * e-mail. `enqueueMail` calls it for every workshop message; a thread post calls it before owing
 * notices (they are e-mailed later by a sweep). See DEVELOPERS.md "Unverified owners send nothing".
 */
export async function assertWorkshopMaySend(
  m: EntityManager,
  workshopId: string,
): Promise<void> {
  const owners: { email: string; verified: number }[] = await m.query(
    "SELECT u.email AS email, (u.emailVerifiedAt IS NOT NULL) AS verified FROM workshop_members wm JOIN users u ON u.id = wm.userId WHERE wm.workshopId = ? AND wm.role = 'owner' ORDER BY wm.createdAt",
    [workshopId],
  );
  if (!owners.length || owners.some((o) => Number(o.verified) === 1)) return;
  throw new HttpError(
    403,
    "email-unverified",
    `Confirm your e-mail address first (we sent a link to ${owners[0]!.email}). Until then Sitecue sends nothing to anyone for this workshop.`,
  );
}

/**
 * Queues an e-mail in the caller's transaction, so the change and its e-mail commit together or
 * not at all. `OutboxWorker` sends it; the Message-ID made here is kept for every attempt.
 * A workshop's message is refused while no owner has verified their address.
 */
export async function enqueueMail(
  m: EntityManager,
  mail: QueuedMail,
): Promise<{ id: string; messageId: string }> {
  if (mail.workshopId) await assertWorkshopMaySend(m, mail.workshopId);
  const id = newId();
  const messageId = `<${randomUUID()}@${MESSAGE_ID_DOMAIN}>`;
  await m.insert(OutboxMessage, {
    id,
    workshopId: mail.workshopId ?? null,
    messageId,
    to: mail.to,
    subject: mail.subject,
    text: mail.text,
    html: mail.html ?? null,
    calendar: mail.calendar ?? null,
    state: "pending",
    attempts: 0,
    // The database's clock, as every comparison the worker makes uses it: app servers may disagree.
    nextAttemptAt: () => "UTC_TIMESTAMP(3)",
  });
  return { id, messageId };
}

/** How long sent rows are kept unless configured (`OUTBOX_KEEP_DAYS`). */
export const DEFAULT_KEEP_DAYS = 30;

/**
 * Deletes `sent` rows whose `sentAt` is more than `keepDays` days ago (by the database's clock),
 * oldest first, at most `batchSize` rows per statement and `maxBatches` statements per call, so a
 * large backlog never holds many locks or a long transaction. Each batch is a plain (non-locking)
 * read of ids on the (state, sentAt) index, then one DELETE by primary key: processes pruning at
 * once may pick the same ids, but the second DELETE only waits for the first and finds them gone
 * (both lock primary keys in ascending order, so they cannot deadlock; a locking read of the
 * secondary index with SKIP LOCKED did, in tests). A sent row never changes again, so deleting by
 * id alone is safe. `pending`, `sending` and `failed` rows are never touched: a failed message
 * stays until someone sends it again. Returns how many rows this call deleted.
 */
export async function pruneSentMail(
  ds: DataSource,
  o: { keepDays: number; batchSize?: number; maxBatches?: number },
): Promise<number> {
  const batchSize = o.batchSize ?? 500;
  const maxBatches = o.maxBatches ?? 100;
  const keepUs = Math.round(o.keepDays * 86_400_000_000);
  let deleted = 0;
  for (let i = 0; i < maxBatches; i++) {
    const old: { id: string }[] = await ds.query(
      "SELECT id FROM outbox_messages WHERE state = 'sent' AND sentAt < UTC_TIMESTAMP(3) - INTERVAL ? MICROSECOND ORDER BY sentAt LIMIT ?",
      [keepUs, batchSize],
    );
    if (!old.length) break;
    const result: { affectedRows: number } = await ds.query(
      "DELETE FROM outbox_messages WHERE id IN (?)",
      [old.map((r) => r.id)],
    );
    deleted += result.affectedRows;
    if (old.length < batchSize) break;
  }
  return deleted;
}

/**
 * Puts a `failed` message of this workshop back in the queue: `pending`, due now, attempts from
 * zero, with its Message-ID unchanged (so a copy that did arrive after all folds with the new
 * one). False when there is no such row in `failed` (already re-queued, sent, or not theirs).
 */
export async function requeueFailedMail(
  m: EntityManager,
  id: string,
  workshopId: string,
): Promise<boolean> {
  const result = await m
    .createQueryBuilder()
    .update(OutboxMessage)
    .set({
      state: "pending",
      attempts: 0,
      lastError: null,
      lastAttemptAt: null,
      nextAttemptAt: () => "UTC_TIMESTAMP(3)",
    })
    .where({ id, workshopId, state: "failed" })
    .execute();
  return (result.affected ?? 0) > 0;
}
