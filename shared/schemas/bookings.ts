import { z } from "zod";
import {
  arrivalWindowSchema,
  bookingChannels,
  bookingStateSchema,
  clockTimeSchema,
  idSchema,
  isoDateSchema,
  partySchema,
  tradeKindSchema,
} from "./common";
import { slotInstantSchema } from "./programme";

const arrivalFields = {
  arrivalWindow: arrivalWindowSchema,
  arrivalFrom: clockTimeSchema.nullable().default(null),
  arrivalTo: clockTimeSchema.nullable().default(null),
};
const arrivalRule = <
  T extends {
    arrivalWindow: string;
    arrivalFrom: string | null;
    arrivalTo: string | null;
  },
>(
  b: T,
) =>
  b.arrivalWindow !== "range" ||
  (b.arrivalFrom !== null &&
    b.arrivalTo !== null &&
    b.arrivalFrom < b.arrivalTo);
const ARRIVAL_WORDS =
  "Give the arrival range as from and to times, from before to";
// zod 4 rewrites this object in .refine (its `message` becomes `error`), so the words are
// kept in their own constant too.
const arrivalMessage = { message: ARRIVAL_WORDS, path: ["arrivalFrom"] };

/** Book a trade for a task: a draft, or sent at once with `send`. */
export const createBookingBodySchema = z
  .object({
    taskId: idSchema,
    tradeId: idSchema,
    start: slotInstantSchema,
    ...arrivalFields,
    shareAddress: z.boolean().default(false),
    /** Required to book on a clash or a day off. */
    overrideReason: z.string().trim().max(500).nullable().default(null),
    send: z.boolean().default(true),
  })
  .refine(arrivalRule, arrivalMessage);
export type CreateBookingBody = z.input<typeof createBookingBodySchema>;

/**
 * Change a draft booking (issue 14): its trade, start, arrival window, address sharing or the
 * reason it stands despite a clash. Fields left out keep their value; the result is checked as a
 * new booking would be.
 */
export const updateBookingBodySchema = z
  .object({
    tradeId: idSchema,
    start: slotInstantSchema,
    arrivalWindow: arrivalWindowSchema,
    arrivalFrom: clockTimeSchema.nullable(),
    arrivalTo: clockTimeSchema.nullable(),
    shareAddress: z.boolean(),
    overrideReason: z.string().trim().max(500).nullable(),
  })
  .partial();
export type UpdateBookingBody = z.input<typeof updateBookingBodySchema>;

/** The arrival rule for a booking as a whole (create, or a draft after its change). */
export const arrivalProblem = (b: {
  arrivalWindow: string;
  arrivalFrom: string | null;
  arrivalTo: string | null;
}): string | null => (arrivalRule(b) ? null : ARRIVAL_WORDS);

/** The maker records the trade's answer given by phone or text. */
export const recordAnswerBodySchema = z
  .object({
    answer: z.enum(["confirm", "decline", "propose"]),
    channel: z.enum(["phone", "text"]),
    proposedStart: isoDateSchema.nullable().default(null),
    note: z.string().trim().max(500).default(""),
  })
  .refine((b) => b.answer !== "propose" || b.proposedStart !== null, {
    message: "Give the date they proposed",
    path: ["proposedStart"],
  });

/** The trade's answer on the confirmation-link page. */
export const linkAnswerBodySchema = z
  .object({
    answer: z.enum(["confirm", "decline", "propose"]),
    proposedStart: isoDateSchema.nullable().default(null),
    reason: z.string().trim().max(500).default(""),
  })
  .refine((b) => b.answer !== "propose" || b.proposedStart !== null, {
    message: "Choose the start you propose",
    path: ["proposedStart"],
  })
  .refine((b) => b.answer !== "decline" || b.reason.length > 0, {
    message: "Say briefly why you can't make it",
    path: ["reason"],
  });

export const proposalDecisionBodySchema = z.object({
  accept: z.boolean(),
  note: z.string().trim().max(500).default(""),
});
export const cancelBookingBodySchema = z.object({
  reason: z.string().trim().min(1, "Say why the booking is cancelled").max(500),
});
export const linkTokenParamsSchema = z.object({
  token: z.string().min(20).max(200),
});

export const bookingEventViewSchema = z.object({
  at: z.string(),
  fromState: bookingStateSchema.nullable(),
  toState: bookingStateSchema,
  channel: z.enum(bookingChannels),
  who: z.string(),
  note: z.string(),
});

/** A booking as the workshop sees it. */
export const bookingResponseSchema = z.object({
  id: idSchema,
  jobId: idSchema,
  taskId: idSchema,
  taskName: z.string(),
  tradeId: idSchema,
  tradeBusinessName: z.string(),
  tradeKind: tradeKindSchema,
  state: bookingStateSchema,
  start: z.string(),
  finish: z.string(),
  arrivalWindow: arrivalWindowSchema,
  arrivalFrom: z.string().nullable(),
  arrivalTo: z.string().nullable(),
  proposedStart: z.string().nullable(),
  shareAddress: z.boolean(),
  overrideReason: z.string().nullable(),
  sequence: z.number(),
  sentAt: z.string().nullable(),
  answeredAt: z.string().nullable(),
  /** Its last day has passed (in the job's time zone): nothing is left to confirm, so no link is offered. */
  visitOver: z.boolean(),
  history: z.array(bookingEventViewSchema),
});
export type BookingResponse = z.infer<typeof bookingResponseSchema>;

export const freeStartSchema = z.object({
  start: z.string(),
  finish: z.string(),
  pastLateStart: z.boolean(),
  message: z.string(),
});

/** What the maker sees before booking a task: the window that keeps handover and each candidate trade's first free start. */
export const bookingOptionsResponseSchema = z.object({
  taskId: idSchema,
  taskName: z.string(),
  party: partySchema,
  durationDays: z.number(),
  earliestStart: z.string(),
  latestStart: z.string(),
  keepsHandover: z.boolean(),
  /** The job's handover date; null when none is agreed (the window then keeps the planned finish). */
  handoverDate: z.string().nullable(),
  /** The arrival times the workshop offers (its settings); the booking form offers only these. */
  arrivalWindows: z.array(arrivalWindowSchema),
  trades: z.array(
    z.object({
      tradeId: idSchema,
      businessName: z.string(),
      kind: tradeKindSchema,
      firstFree: freeStartSchema.nullable(),
      /** Declined this task before. */
      declined: z.boolean(),
    }),
  ),
});
export type BookingOptionsResponse = z.infer<
  typeof bookingOptionsResponseSchema
>;

/** A clash or day off found when booking; 409 with this in the message unless overridden. */
export const bookingCheckSchema = z.object({
  problems: z.array(z.string()),
  nextFreeStart: z.string().nullable(),
});

/** What the trade sees on the confirmation-link page (no account needed). */
export const linkPageResponseSchema = z.object({
  status: z.enum(["current", "dates-changed", "cancelled"]),
  /** The day the workshop cancelled it (YYYY-MM-DD, local to the job), when cancelled. */
  cancelledOn: z.string().nullable(),
  workshopName: z.string(),
  tradeBusinessName: z.string(),
  taskName: z.string(),
  jobArea: z.string(),
  /** Only once confirmed, or when the maker shared it. */
  siteAddress: z.string().nullable(),
  accessNotes: z.string().nullable(),
  state: bookingStateSchema,
  start: z.string(),
  finish: z.string(),
  arrivalWindow: arrivalWindowSchema,
  arrivalFrom: z.string().nullable(),
  arrivalTo: z.string().nullable(),
  proposedStart: z.string().nullable(),
  caution: z.string().nullable(),
  customerNote: z.string(),
  waitsOn: z.array(
    z.object({
      name: z.string(),
      state: z.string(),
      plannedFinish: z.string().nullable(),
      allowsFrom: z.string().nullable(),
    }),
  ),
  /** Dates (YYYY-MM-DD) inside the start window that keep handover. */
  windowDates: z.array(z.string()),
  /** Working days the trade is free for the task's length, within the next weeks. */
  freeDates: z.array(z.string()),
  handoverKept: z.boolean(),
  /** The job's handover date; null when none is agreed (the window then keeps the planned finish). */
  handoverDate: z.string().nullable(),
  answeredAt: z.string().nullable(),
  canAnswer: z.boolean(),
});
export type LinkPageResponse = z.infer<typeof linkPageResponseSchema>;
