import { z } from "zod";
import { idSchema } from "./common";
import { emailSchema } from "./auth";

export const customerBodySchema = z.object({
  name: z.string().trim().min(1, "Enter the customer's name").max(120),
  email: emailSchema,
  phone: z
    .string()
    .trim()
    .regex(/^[+0-9 ()-]{6,24}$/, "Use digits, spaces, + ( ) or -")
    .optional(),
});
export type CustomerBody = z.input<typeof customerBodySchema>;

export const customerResponseSchema = z.object({
  id: idSchema,
  name: z.string(),
  email: z.string(),
  phone: z.string().nullable(),
  hasAccount: z.boolean(),
});
export type CustomerResponse = z.infer<typeof customerResponseSchema>;
