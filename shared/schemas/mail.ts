import { z } from "zod";

/** A message caught by the local SMTP fake (development and tests only). */
export const caughtMailSchema = z.object({
  id: z.string(),
  /** The Message-ID header as sent, angle brackets included (RFC 5322 §3.6.4). */
  messageId: z.string().nullable(),
  receivedAt: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  html: z.string().nullable(),
  links: z.array(z.string()),
  /** Each distinct iCalendar object attached (text/calendar or .ics), with its METHOD. */
  calendars: z.array(
    z.object({ method: z.string().nullable(), content: z.string() }),
  ),
});
export type CaughtMail = z.infer<typeof caughtMailSchema>;

/** `POST /workshops/:workshopId/outbox/:messageId/retry`: a failed e-mail back in the queue. */
export const outboxRetryResponseSchema = z.object({
  id: z.string(),
  /** The Message-ID header it keeps (RFC 5322 §3.6.4), angle brackets included. */
  messageId: z.string(),
  to: z.string(),
  state: z.literal("pending"),
});
export type OutboxRetryResponse = z.infer<typeof outboxRetryResponseSchema>;
