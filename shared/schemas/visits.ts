import { z } from "zod";
import {
  arrivalWindowSchema,
  bookingStateSchema,
  clockTimeSchema,
  idSchema,
} from "./common";
import { linkPageResponseSchema } from "./bookings";
import { drawingKindSchema } from "./drawings";

// A trade's visits: their own bookings, across every workshop they work for, as they see them
// (brief, roles table: "their own tasks in full; the tasks they wait on as name + planned date +
// status (no other trade's contact details, no internal notes)").

export const visitParamsSchema = z.object({ bookingId: idSchema });

/** Where the trade's task stands, from the programme engine. */
export const visitReadinessSchema = z.object({
  state: z.enum(["done", "started", "clear", "waiting"]),
  /** When clear: the first day it can start (the engine's planned start). */
  clearFrom: z.string().nullable(),
  waitingOn: z.array(
    z.object({
      name: z.string(),
      /** The predecessor's planned finish. */
      plannedFinish: z.string().nullable(),
      /** The first start it allows. */
      allowsFrom: z.string(),
      /** The predecessor is done: only time (the rest of its day, a lag) is left to wait. */
      done: z.boolean(),
    }),
  ),
});
export type VisitReadiness = z.infer<typeof visitReadinessSchema>;

/** One visit on the trade's home. */
export const visitSchema = z.object({
  bookingId: idSchema,
  jobId: idSchema,
  taskId: idSchema,
  workshopName: z.string(),
  tradeBusinessName: z.string(),
  taskName: z.string(),
  jobTitle: z.string(),
  jobArea: z.string(),
  /** Only once confirmed, or when the maker chose to share it. */
  siteAddress: z.string().nullable(),
  state: bookingStateSchema,
  start: z.string(),
  finish: z.string(),
  arrivalWindow: arrivalWindowSchema,
  arrivalFrom: z.string().nullable(),
  arrivalTo: z.string().nullable(),
  proposedStart: z.string().nullable(),
  progress: z.enum(["not-started", "started", "done"]),
  actualStart: z.string().nullable(),
  actualFinish: z.string().nullable(),
  durationDays: z.number(),
  readiness: visitReadinessSchema,
  caution: z.string().nullable(),
  /** The drawings, templates and site photos shared with them on this job. */
  drawings: z.array(
    z.object({
      id: idSchema,
      title: z.string(),
      kind: drawingKindSchema,
      currentRevision: z.string(),
      /** Linked to this visit's task. */
      forThisTask: z.boolean(),
    }),
  ),
  /** The latest "running late" they sent for this visit. */
  runningLate: z
    .object({ day: z.string(), arrivalTime: z.string(), at: z.string() })
    .nullable(),
  /** What they may do now (the server checks again). */
  can: z.object({
    answer: z.boolean(),
    markStarted: z.boolean(),
    markDone: z.boolean(),
    runningLate: z.boolean(),
    extend: z.boolean(),
    upload: z.boolean(),
  }),
});
export type Visit = z.infer<typeof visitSchema>;

/** GET /me/visits: upcoming first (soonest first), then past and withdrawn ones (latest first). */
export const myVisitsResponseSchema = z.object({
  upcoming: z.array(visitSchema),
  past: z.array(visitSchema),
});
export type MyVisitsResponse = z.infer<typeof myVisitsResponseSchema>;

/** GET /visits/:bookingId: the visit, and everything the confirmation-link page shows. */
export const visitDetailResponseSchema = z.object({
  visit: visitSchema,
  page: linkPageResponseSchema,
});
export type VisitDetailResponse = z.infer<typeof visitDetailResponseSchema>;

/** POST /visits/:bookingId/progress: mark their own task started or done (now, in the job's time). */
export const visitProgressBodySchema = z.object({
  mark: z.enum(["started", "done"]),
});
export type VisitProgressBody = z.input<typeof visitProgressBodySchema>;

/** POST /visits/:bookingId/running-late: the time they now expect to arrive. */
export const runningLateBodySchema = z.object({
  arrivalTime: clockTimeSchema,
  note: z.string().trim().max(300).default(""),
});
export type RunningLateBody = z.input<typeof runningLateBodySchema>;

/** POST /visits/:bookingId/extend(/preview): one more working day, at the programme version seen. */
export const extendVisitBodySchema = z.object({
  version: z
    .number({ message: "The programme version is missing" })
    .int()
    .min(1),
});
export type ExtendVisitBody = z.input<typeof extendVisitBodySchema>;

/** The knock-on of one more day, in the words and names a trade may see. */
export const extendImpactSchema = z.object({
  version: z.number(),
  taskName: z.string(),
  fromFinish: z.string(),
  toFinish: z.string(),
  moves: z.array(
    z.object({
      taskName: z.string(),
      fromStart: z.string(),
      toStart: z.string(),
      byDays: z.number(),
    }),
  ),
  /** Booked tasks that move and will need their trade to confirm again (names only). */
  reconfirm: z.array(
    z.object({ taskName: z.string(), proposedStart: z.string() }),
  ),
  /** Clashes or non-working days the longer task would meet on their own calendar. */
  problems: z.array(z.string()),
  handover: z.object({
    date: z.string().nullable(),
    finishBefore: z.string().nullable(),
    finishAfter: z.string().nullable(),
    changeDays: z.number(),
  }),
});
export type ExtendImpact = z.infer<typeof extendImpactSchema>;

export const extendResponseSchema = z.object({
  impact: extendImpactSchema,
  visit: visitSchema,
});
