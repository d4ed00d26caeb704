import { z } from "zod";
import { idSchema, partySchema, tradeKindSchema } from "./common";

/**
 * What needs the maker's attention, across the workshop's open jobs (issue 8, maker's home).
 * Each kind is one situation with one fix; `order` below is the documented urgency rule.
 */
export const attentionKinds = [
  // The programme is in trouble: act before anything else.
  "handover-at-risk",
  "clash",
  "customer-away",
  // An e-mail that never went: whoever it was for does not know (a booking, an invitation).
  "mail-failed",
  // A trade is waiting for the workshop.
  "declined",
  "date-proposed",
  // The workshop is waiting for a trade.
  "needs-reconfirming",
  "awaiting-answer",
  // Work that can start and nobody is booked.
  "not-booked",
  // Messages.
  "unread",
] as const;
export const attentionKindSchema = z.enum(attentionKinds);
export type AttentionKind = z.infer<typeof attentionKindSchema>;

/** How an item reads at a glance (always with words too, never colour alone). */
export const attentionTones = ["risk", "wait", "info"] as const;

export const attentionItemSchema = z.object({
  /** Stable across refreshes: kind plus the record it is about. */
  id: z.string(),
  kind: attentionKindSchema,
  tone: z.enum(attentionTones),
  /** The job it is about; null for what is the workshop's alone (an e-mail that failed). */
  job: z
    .object({ id: idSchema, title: z.string(), area: z.string() })
    .nullable(),
  task: z
    .object({ id: idSchema, name: z.string(), party: partySchema })
    .nullable(),
  trade: z
    .object({
      id: idSchema,
      businessName: z.string(),
      kind: tradeKindSchema,
    })
    .nullable(),
  bookingId: idSchema.nullable(),
  /** The plain sentence the maker reads. */
  sentence: z.string(),
  /** ISO instant the wait began (sent, answered, newest message), when it is a wait. */
  since: z.string().nullable(),
  /** How long it has waited, in words ("for 3 working days", "for 5 hours"); null when not a wait. */
  waited: z.string().nullable(),
  /**
   * The one fix: a label and the client path of the screen where it is fixed, or, when one click
   * fixes it there and then, the outbox message to send again
   * (`POST /workshops/:workshopId/outbox/:messageId/retry`).
   */
  action: z.union([
    z.object({ label: z.string(), to: z.string() }),
    z.object({ label: z.string(), retryMessageId: idSchema }),
  ]),
});
export type AttentionItem = z.infer<typeof attentionItemSchema>;

export const attentionResponseSchema = z.object({
  /** "Today" in the workshop's terms (YYYY-MM-DD) the list was worked out for. */
  today: z.string(),
  /** Open jobs looked at (survey, planned, on site). */
  jobsChecked: z.number().int(),
  /** Most urgent first (see `attentionKinds` and the service's ordering rule). */
  items: z.array(attentionItemSchema),
});
export type AttentionResponse = z.infer<typeof attentionResponseSchema>;
