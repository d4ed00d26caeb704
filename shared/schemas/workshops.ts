import { z } from "zod";
import {
  arrivalWindowSchema,
  clockTimeSchema,
  holidayRegionSchema,
  type HolidayRegion,
  idSchema,
  memberRoleSchema,
  weekdaysSchema,
  workshopNameSchema,
} from "./common";
import { emailSchema } from "./auth";

/**
 * The nations a workshop (and a job) can follow for bank holidays. England and Wales share one set
 * of bank holidays (GOV.UK, "UK bank holidays": "England and Wales", "Scotland", "Northern
 * Ireland"), so they are one choice in words, stored as GB-ENG; GB-WLS, stored by older records,
 * reads the same and keeps working.
 */
export const nationChoices = ["GB-ENG", "GB-SCT", "GB-NIR"] as const;

/** The one word map for a nation: every screen that names a holiday region uses it. */
export const nationLabels: Record<HolidayRegion, string> = {
  "GB-ENG": "England & Wales",
  "GB-WLS": "England & Wales",
  "GB-SCT": "Scotland",
  "GB-NIR": "Northern Ireland",
};

/** An IANA time zone this runtime knows (ECMA-402: `Intl.DateTimeFormat` refuses an unknown one). */
export const timeZoneSchema = z
  .string()
  .trim()
  .min(1, "Choose a time zone")
  .max(64)
  .refine((tz) => {
    try {
      new Intl.DateTimeFormat("en-GB", { timeZone: tz });
      return true;
    } catch {
      return false;
    }
  }, "Choose a time zone from the list, like Europe/London");

/** How many working days before a visit the trade's reminder goes: 0 sends none. */
export const REMINDER_DAYS_MAX = 5;

/** Where the set-up after sign-up stands: the step to come back to. */
export const setupSteps = ["nation", "days", "arrivals", "next"] as const;
export const setupStepSchema = z.enum(setupSteps);
export type SetupStep = z.infer<typeof setupStepSchema>;

const uniqueList = <T>(a: T[]) => new Set(a).size === a.length;

/**
 * Everything a workshop sets for itself — one schema for the API and the forms. Day hours follow
 * the engine's half-day slots, which split at 12:00: the day starts before midday and ends after.
 */
export const workshopSettingsSchema = z
  .object({
    name: workshopNameSchema,
    town: z.string().trim().max(120),
    holidayRegion: holidayRegionSchema.nullable(),
    timeZone: timeZoneSchema,
    workingWeekdays: weekdaysSchema,
    dayStart: clockTimeSchema.refine(
      (t) => t < "12:00",
      "The working day must start before 12:00",
    ),
    dayEnd: clockTimeSchema.refine(
      (t) => t > "12:00",
      "The working day must end after 12:00",
    ),
    siteWeekdays: weekdaysSchema,
    arrivalWindows: z
      .array(arrivalWindowSchema)
      .min(1, "Offer at least one arrival time")
      .refine(uniqueList, "Each arrival time once"),
    reminderDays: z
      .number()
      .int("Use a whole number of days")
      .min(0, "Use 0 for no reminder")
      .max(
        REMINDER_DAYS_MAX,
        `At most ${REMINDER_DAYS_MAX} working days before`,
      ),
  })
  .strict();
export type WorkshopSettings = z.infer<typeof workshopSettingsSchema>;

export const workshopResponseSchema = z.object({
  id: idSchema,
  name: z.string(),
  town: z.string(),
  timeZone: z.string(),
  holidayRegion: holidayRegionSchema.nullable(),
  workingWeekdays: z.array(z.number()),
  dayStart: z.string(),
  dayEnd: z.string(),
  siteWeekdays: z.array(z.number()),
  arrivalWindows: z.array(arrivalWindowSchema),
  reminderDays: z.number(),
  /** The set-up step to come back to; null once set-up is finished or skipped to the end. */
  setupStep: setupStepSchema.nullable(),
  setupCompletedAt: z.string().nullable(),
});
export type WorkshopResponse = z.infer<typeof workshopResponseSchema>;

/** Any of the settings, plus where the set-up stands; checked again whole against the stored ones. */
export const updateWorkshopBodySchema = workshopSettingsSchema
  .partial()
  .extend({
    setupStep: setupStepSchema.optional(),
    /** True when the owner finishes (or leaves) the set-up for good. */
    setupDone: z.boolean().optional(),
  })
  .strict()
  .refine((b) => !(b.dayStart && b.dayEnd) || b.dayStart < b.dayEnd, {
    message: "The day must end after it starts",
    path: ["dayEnd"],
  });
export type UpdateWorkshopBody = z.input<typeof updateWorkshopBodySchema>;

/** A booking that would need re-confirming after a settings change. */
export const replanBookingSchema = z.object({
  bookingId: idSchema,
  taskName: z.string(),
  tradeName: z.string(),
  bookedStart: z.string(),
  proposedStart: z.string().nullable(),
  reason: z.string(),
});

/** What a settings change would do to one open job, from the engine. */
export const replanJobSchema = z.object({
  jobId: idSchema,
  title: z.string(),
  finishBefore: z.string().nullable(),
  finishAfter: z.string().nullable(),
  /** Working days later (negative: sooner) on the workshop calendar. */
  changeDays: z.number(),
  handoverDate: z.string().nullable(),
  handoverAtRiskBefore: z.boolean(),
  handoverAtRisk: z.boolean(),
  /** The job's own nation follows the workshop's (it matched the old one). */
  nationFollows: z.boolean(),
  movedTasks: z.number(),
  bookings: z.array(replanBookingSchema),
});
export type ReplanJob = z.infer<typeof replanJobSchema>;

export const settingsPreviewResponseSchema = z.object({
  /** False when nothing proposed touches the programme (name, town, arrivals, reminders). */
  replans: z.boolean(),
  /** Open jobs the change moves (finish, a task or a booking), most affected first. */
  jobs: z.array(replanJobSchema),
  /** Open jobs it leaves as they are. */
  unchangedJobs: z.number(),
});
export type SettingsPreview = z.infer<typeof settingsPreviewResponseSchema>;

export const memberResponseSchema = z.object({
  userId: idSchema,
  name: z.string(),
  email: z.string(),
  role: memberRoleSchema,
  joinedAt: z.string(),
});
export type MemberResponse = z.infer<typeof memberResponseSchema>;

export const invitationRoleSchema = z.enum(["fitter", "trade", "customer"]);

export const createInvitationBodySchema = z
  .object({
    role: invitationRoleSchema,
    name: z.string().trim().min(1, "Enter their name").max(120),
    email: emailSchema,
    tradeId: idSchema.optional(),
    customerId: idSchema.optional(),
  })
  .refine((b) => b.role !== "trade" || b.tradeId, {
    message: "Choose the trade they speak for",
    path: ["tradeId"],
  })
  .refine((b) => b.role !== "customer" || b.customerId, {
    message: "Choose the customer",
    path: ["customerId"],
  });
export type CreateInvitationBody = z.input<typeof createInvitationBodySchema>;

export const invitationResponseSchema = z.object({
  id: idSchema,
  name: z.string(),
  email: z.string(),
  role: invitationRoleSchema,
  expiresAt: z.string(),
  acceptedAt: z.string().nullable(),
  createdAt: z.string(),
  /** The address has a Sitecue account already: they are asked to sign in and link it. */
  existingAccount: z.boolean(),
});
export type InvitationResponse = z.infer<typeof invitationResponseSchema>;
