import { z } from "zod";
import {
  clockTimeSchema,
  holidayRegionSchema,
  idSchema,
  memberRoleSchema,
  weekdaysSchema,
} from "./common";
import { emailSchema } from "./auth";

export const workshopResponseSchema = z.object({
  id: idSchema,
  name: z.string(),
  town: z.string(),
  timeZone: z.string(),
  holidayRegion: holidayRegionSchema.nullable(),
  workingWeekdays: z.array(z.number()),
  dayStart: z.string(),
  dayEnd: z.string(),
});
export type WorkshopResponse = z.infer<typeof workshopResponseSchema>;

export const updateWorkshopBodySchema = z
  .object({
    name: z.string().trim().min(1, "Enter the workshop's name").max(120),
    town: z.string().trim().max(120),
    holidayRegion: holidayRegionSchema.nullable(),
    workingWeekdays: weekdaysSchema,
    dayStart: clockTimeSchema,
    dayEnd: clockTimeSchema,
  })
  .partial()
  .refine((b) => !(b.dayStart && b.dayEnd) || b.dayStart < b.dayEnd, {
    message: "The day must end after it starts",
    path: ["dayEnd"],
  });

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
