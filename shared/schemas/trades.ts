import { z } from "zod";
import {
  clockTimeSchema,
  idSchema,
  isoDateSchema,
  tradeKindSchema,
  weekdaysSchema,
} from "./common";
import { emailSchema } from "./auth";

const phoneSchema = z
  .string()
  .trim()
  .regex(/^[+0-9 ()-]{6,24}$/, "Use digits, spaces, + ( ) or -");

export const tradeBodySchema = z
  .object({
    businessName: z.string().trim().min(1, "Enter the business name").max(120),
    kind: tradeKindSchema,
    contactName: z.string().trim().min(1, "Enter who to ask for").max(120),
    email: emailSchema,
    phone: phoneSchema,
    workingWeekdays: weekdaysSchema.default([1, 2, 3, 4, 5]),
    dayStart: clockTimeSchema.default("08:00"),
    dayEnd: clockTimeSchema.default("16:30"),
    daysOff: z.array(isoDateSchema).max(366).default([]),
  })
  .refine((b) => b.dayStart < b.dayEnd, {
    message: "The day must end after it starts",
    path: ["dayEnd"],
  });
export type TradeBody = z.input<typeof tradeBodySchema>;

export const updateTradeBodySchema = z
  .object({
    businessName: z.string().trim().min(1, "Enter the business name").max(120),
    kind: tradeKindSchema,
    contactName: z.string().trim().min(1).max(120),
    email: emailSchema,
    phone: phoneSchema,
    workingWeekdays: weekdaysSchema,
    dayStart: clockTimeSchema,
    dayEnd: clockTimeSchema,
    daysOff: z.array(isoDateSchema).max(366),
  })
  .partial()
  .refine((b) => !(b.dayStart && b.dayEnd) || b.dayStart < b.dayEnd, {
    message: "The day must end after it starts",
    path: ["dayEnd"],
  });

export const tradeResponseSchema = z.object({
  id: idSchema,
  workshopId: idSchema,
  businessName: z.string(),
  kind: tradeKindSchema,
  contactName: z.string(),
  email: z.string(),
  phone: z.string(),
  workingWeekdays: z.array(z.number()),
  dayStart: z.string(),
  dayEnd: z.string(),
  daysOff: z.array(z.string()),
  hasAccount: z.boolean(),
  /**
   * Not linked yet, but the e-mail belongs to a Sitecue account: an invitation asks them to link
   * it. Nothing else about that account (which workshops, their records) is told.
   */
  emailHasAccount: z.boolean(),
});
export type TradeResponse = z.infer<typeof tradeResponseSchema>;

/** A trade's other commitments in a date range: this workshop's bookings by name, other workshops' only as busy. */
export const tradeBusyQuerySchema = z
  .object({ from: isoDateSchema, to: isoDateSchema })
  .refine((q) => q.from <= q.to, {
    message: "The range must end after it starts",
    path: ["to"],
  });

export const tradeBusyResponseSchema = z.object({
  busy: z.array(
    z.object({
      start: z.string(),
      finish: z.string(),
      /** "Template coving — Alcove cabinets, front room", or "Busy (another workshop)". */
      label: z.string(),
      ownWorkshop: z.boolean(),
    }),
  ),
});
export type TradeBusyResponse = z.infer<typeof tradeBusyResponseSchema>;
