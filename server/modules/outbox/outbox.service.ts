import type { DataSource, EntityManager } from "typeorm";
import type { OutboxRetryResponse } from "../../../shared/schemas";
import { HttpError, notFound } from "../../http/errors";
import { OutboxMessage } from "../../infra/outbox/outbox.entity";
import { requeueFailedMail } from "../../infra/outbox/outbox";
import { authorize, type Actor } from "../../policies";

/** Most failed e-mails listed at once (newest first): an outage should not bury everything else. */
export const FAILED_MAIL_SHOWN = 20;

/** The workshop's e-mails that ended `failed`, last tried first. */
export function failedMailOf(
  m: EntityManager,
  workshopId: string,
): Promise<OutboxMessage[]> {
  return m.find(OutboxMessage, {
    where: { workshopId, state: "failed" },
    order: { lastAttemptAt: "DESC", createdAt: "DESC" },
    take: FAILED_MAIL_SHOWN,
  });
}

const clip = (s: string, n: number) =>
  s.length > n ? `${s.slice(0, n - 1).trimEnd()}…` : s;

/**
 * The worker's `lastError` (nodemailer's message) in a few plain words for the workshop. An SMTP
 * reply keeps its code and text (RFC 5321 §4.2: "550 5.1.1 …"), since that is what a mail admin
 * or the recipient would need to hear.
 */
export function shortReason(lastError: string | null): string {
  if (!lastError) return "no reason was recorded";
  const reply = /\b([45]\d\d)[ -](.+)$/s.exec(lastError);
  if (reply) {
    const refusal = reply[1].startsWith("5") ? "refused it" : "turned it away";
    return `the mail server ${refusal} (${clip(`${reply[1]} ${reply[2].trim()}`, 160)})`;
  }
  if (
    /ECONNREFUSED|ETIMEDOUT|ENOTFOUND|EAI_AGAIN|ECONNRESET|Greeting never received|Connection timeout/i.test(
      lastError,
    )
  )
    return "Sitecue could not reach its mail server";
  if (/^Claim by .* expired/.test(lastError))
    return "sending stopped part-way, so it may have arrived after all";
  return clip(lastError.split("\n")[0], 160);
}

/**
 * Sends a failed e-mail again: back to `pending` with its attempts from zero and its Message-ID
 * unchanged (owners and fitters of its workshop). 404 when the workshop has no such message; 409
 * when it is not failed (being sent, sent, or already back in the queue).
 */
export async function retryMail(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  messageId: string,
): Promise<OutboxRetryResponse> {
  authorize(actor, "outbox.retry", { kind: "workshop", workshopId });
  return ds.transaction(async (m) => {
    const row = await m.findOne(OutboxMessage, {
      where: { id: messageId, workshopId },
      lock: { mode: "pessimistic_write" },
    });
    if (!row) throw notFound("That e-mail");
    if (row.state !== "failed")
      throw new HttpError(
        409,
        "conflict",
        row.state === "sent"
          ? "That e-mail has been sent; there is nothing to send again."
          : "That e-mail is already waiting to be sent.",
      );
    await requeueFailedMail(m, row.id, workshopId);
    return {
      id: row.id,
      messageId: row.messageId,
      to: row.to,
      state: "pending",
    };
  });
}
