import { randomUUID } from "node:crypto";
import type { EntityManager } from "typeorm";
import { newId } from "../../db/columns";
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
  /** The workshop the message is about, when there is one (for support and clean-up). */
  workshopId?: string | null;
}

// The right-hand side only has to be unique to us (RFC 5322 §3.6.4); a UUID on the left does that.
const MESSAGE_ID_DOMAIN = "sitecue.example.test";

/**
 * Queues an e-mail in the caller's transaction, so the change and its e-mail commit together or
 * not at all. `OutboxWorker` sends it; the Message-ID made here is kept for every attempt.
 */
export async function enqueueMail(
  m: EntityManager,
  mail: QueuedMail,
): Promise<{ id: string; messageId: string }> {
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
