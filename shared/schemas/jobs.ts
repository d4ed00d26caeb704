import { z } from "zod";
import {
  arrivalWindowSchema,
  bookingStateSchema,
  holidayRegionSchema,
  idSchema,
  isoDateSchema,
  jobStatusSchema,
  partySchema,
  tradeKindSchema,
  weekdaysSchema,
} from "./common";
import { timeZoneSchema } from "./workshops";

export const viewerRoleSchema = z.enum([
  "owner",
  "fitter",
  "trade",
  "customer",
]);
export type ViewerRole = z.infer<typeof viewerRoleSchema>;

export const createJobBodySchema = z.object({
  title: z.string().trim().min(1, "Give the job a short title").max(160),
  customerId: idSchema,
  siteAddress: z.string().trim().min(1, "Enter the site address").max(300),
  postcode: z
    .string()
    .trim()
    .toUpperCase()
    .regex(
      /^[A-Z]{1,2}\d[A-Z\d]? ?\d[A-Z]{2}$/,
      "Enter a UK postcode like AB1 2CD",
    ),
  area: z
    .string()
    .trim()
    .min(1, "Enter the town or area trades see before they confirm")
    .max(120),
  holidayRegion: holidayRegionSchema,
  /** The workshop's time zone when left out. */
  timeZone: timeZoneSchema.optional(),
  status: jobStatusSchema.default("survey"),
  handoverDate: isoDateSchema.nullable().default(null),
  /** The workshop's usual site days (its settings) when left out. */
  siteWeekdays: weekdaysSchema.optional(),
  accessNotes: z.string().max(2000).default(""),
  /** Start from one of the workshop's starting programmes. */
  starterId: idSchema.optional(),
});
export type CreateJobBody = z.input<typeof createJobBodySchema>;

export const updateJobBodySchema = z.object({
  version: z.number().int().min(1),
  title: z.string().trim().min(1).max(160).optional(),
  siteAddress: z.string().trim().min(1).max(300).optional(),
  area: z.string().trim().min(1).max(120).optional(),
  status: jobStatusSchema.optional(),
  handoverDate: isoDateSchema.nullable().optional(),
  siteWeekdays: weekdaysSchema.optional(),
  accessNotes: z.string().max(2000).optional(),
});

/** One line of the jobs list. */
export const jobSummarySchema = z.object({
  id: idSchema,
  workshopId: idSchema,
  workshopName: z.string(),
  title: z.string(),
  area: z.string(),
  status: jobStatusSchema,
  customerName: z.string().nullable(),
  handoverDate: z.string().nullable(),
  nextEvent: z.object({ date: z.string(), label: z.string() }).nullable(),
  viewerRole: viewerRoleSchema,
});
export type JobSummary = z.infer<typeof jobSummarySchema>;

export const taskViewSchema = z.object({
  id: idSchema,
  name: z.string(),
  party: partySchema,
  durationDays: z.number(),
  status: z.enum(["not-started", "started", "done"]),
  /** Present only for tasks the viewer may see in full. */
  detail: z
    .object({
      notEarlierThan: z.string().nullable(),
      actualStart: z.string().nullable(),
      actualFinish: z.string().nullable(),
      customerNote: z.string(),
      internalNote: z.string().nullable(),
      caution: z.string().nullable(),
      sortOrder: z.number(),
    })
    .nullable(),
});
export type TaskView = z.infer<typeof taskViewSchema>;

export const linkViewSchema = z.object({
  id: idSchema,
  fromTaskId: idSchema,
  toTaskId: idSchema,
  kind: z.enum(["FS", "SS", "FF"]),
  lag: z.number(),
  lagUnit: z.enum(["workingDays", "elapsedHours"]),
});

export const bookingViewSchema = z.object({
  id: idSchema,
  taskId: idSchema,
  tradeId: idSchema,
  tradeBusinessName: z.string(),
  tradeKind: tradeKindSchema,
  state: bookingStateSchema,
  start: z.string(),
  finish: z.string(),
  arrivalWindow: arrivalWindowSchema,
  arrivalFrom: z.string().nullable(),
  arrivalTo: z.string().nullable(),
});
export type BookingView = z.infer<typeof bookingViewSchema>;

export const partyViewSchema = z.object({
  kind: z.enum(["customer", "trade"]),
  id: idSchema,
  name: z.string(),
  tradeKind: tradeKindSchema.nullable(),
  /** Contact details only for the workshop. */
  email: z.string().nullable(),
  phone: z.string().nullable(),
});

export const jobDetailSchema = z.object({
  id: idSchema,
  workshopId: idSchema,
  workshopName: z.string(),
  version: z.number(),
  title: z.string(),
  status: jobStatusSchema,
  area: z.string(),
  /** Full address: workshop, the customer, and trades with a confirmed booking. */
  siteAddress: z.string().nullable(),
  postcode: z.string().nullable(),
  accessNotes: z.string().nullable(),
  holidayRegion: holidayRegionSchema,
  timeZone: z.string(),
  handoverDate: z.string().nullable(),
  siteWeekdays: z.array(z.number()),
  viewerRole: viewerRoleSchema,
  parties: z.array(partyViewSchema),
  tasks: z.array(taskViewSchema),
  links: z.array(linkViewSchema),
  bookings: z.array(bookingViewSchema),
});
export type JobDetail = z.infer<typeof jobDetailSchema>;
