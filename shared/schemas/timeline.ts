import { z } from "zod";
import { arrivalWindowSchema, isoDateSchema, partySchema } from "./common";

// The customer's timeline: visits as the householder sees them (brief, Words: "visit" is how a
// booking is shown to the customer) — who, which days, arrival window, what to prepare — and the
// dates they will be away. Never: float, booking states, internal notes, a trade's contacts.

/** At most this many away ranges per job (one a week for a quarter is plenty). */
export const MAX_AWAY_RANGES = 12;
/** Away dates reach at most this many days ahead (a year). */
export const AWAY_MAX_DAYS_AHEAD = 366;

/** One stretch of days the customer is away: first and last day, both included. */
export const awayRangeSchema = z
  .object({ from: isoDateSchema, to: isoDateSchema })
  .refine((r) => r.from <= r.to, {
    message: "The last day comes on or after the first",
    path: ["to"],
  });
export type AwayRange = z.infer<typeof awayRangeSchema>;

/**
 * PUT /jobs/:jobId/away-dates: the whole list of coming away ranges (it replaces the last one).
 * "Not in the past" and "at most a year ahead" depend on the job's own today, so the server
 * checks those and answers 400 with fields.
 */
export const setAwayDatesBodySchema = z.object({
  ranges: z
    .array(awayRangeSchema)
    .max(MAX_AWAY_RANGES, `At most ${MAX_AWAY_RANGES} stretches of dates`),
});
export type SetAwayDatesBody = z.infer<typeof setAwayDatesBodySchema>;

const arrivalSchema = z.object({
  window: arrivalWindowSchema,
  from: z.string().nullable(),
  to: z.string().nullable(),
});
export type VisitArrival = z.infer<typeof arrivalSchema>;

/** What a visit was when the person last looked, for "was Tue 12 Jan". */
export const timelineVisitWasSchema = z.object({
  start: z.string(),
  finish: z.string(),
  arrival: arrivalSchema,
});

export const timelineVisitSchema = z.object({
  /** The booking's id for a trade's visit; the task's id for the workshop's own visit. */
  id: z.string(),
  /** "workshop" for the workshop's own fitting visits, else the trade kind. */
  party: partySchema,
  /** The business: the trade's name, or the workshop's. */
  businessName: z.string(),
  /** The work, in the trade's words ("Template coving"). */
  taskName: z.string(),
  /** Local wall-clock "YYYY-MM-DDTHH:mm" in the job's time zone. */
  start: z.string(),
  finish: z.string(),
  arrival: arrivalSchema,
  /** What to prepare (the task's note for the customer); null when there is nothing to do. */
  prepare: z.string().nullable(),
  /**
   * The days are settled: the trade has confirmed them (the workshop's own visits are its own
   * plan). False while a booking is unanswered, proposed otherwise or moved and not yet
   * re-confirmed: the customer is told "to be confirmed" (the booking lifecycle's customerSees).
   */
  settled: z.boolean(),
  /** The visit is over (its last day has passed, or the workshop marked it done). */
  past: z.boolean(),
  /** Since the person last looked: a new visit, or one whose days or arrival changed. */
  change: z
    .discriminatedUnion("kind", [
      z.object({ kind: z.literal("new") }),
      z.object({ kind: z.literal("moved"), was: timelineVisitWasSchema }),
    ])
    .nullable(),
  /** The days of this visit on which the customer said they are away. */
  awayDays: z.array(isoDateSchema),
});
export type TimelineVisit = z.infer<typeof timelineVisitSchema>;

export const timelineResponseSchema = z.object({
  jobId: z.string(),
  jobTitle: z.string(),
  workshopName: z.string(),
  timeZone: z.string(),
  /** The job's today, YYYY-MM-DD. */
  today: isoDateSchema,
  handoverDate: isoDateSchema.nullable(),
  /** The handover date when they last looked, if it has changed since. */
  handoverWas: isoDateSchema.nullable(),
  visits: z.array(timelineVisitSchema),
  /** Coming away ranges (today onwards). */
  away: z.array(awayRangeSchema),
  /** When this person last looked at this timeline (ISO instant); null the first time. */
  lastSeenAt: z.string().nullable(),
  /** The job's version this was built from; marking seen carries it back. */
  version: z.number().int(),
});
export type TimelineResponse = z.infer<typeof timelineResponseSchema>;

/** POST /jobs/:jobId/timeline/seen: "I have seen the timeline built from this version". */
export const markTimelineSeenBodySchema = z.object({
  version: z.number().int().min(0),
});
export const markTimelineSeenResponseSchema = z.object({
  seenAt: z.string(),
});

/** A booking standing on a day the customer is away: for the maker's attention list. */
export const awayClashSchema = z.object({
  jobId: z.string(),
  jobTitle: z.string(),
  bookingId: z.string(),
  taskId: z.string(),
  taskName: z.string(),
  tradeName: z.string(),
  start: z.string(),
  finish: z.string(),
  /** The booking's days on which the customer is away. */
  awayDays: z.array(isoDateSchema),
});
export type AwayClash = z.infer<typeof awayClashSchema>;

export const awayClashesResponseSchema = z.object({
  clashes: z.array(awayClashSchema),
});
export type AwayClashesResponse = z.infer<typeof awayClashesResponseSchema>;
