import { z } from "zod";

/** A message caught by the local SMTP fake (development and tests only). */
export const caughtMailSchema = z.object({
  id: z.string(),
  receivedAt: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  html: z.string().nullable(),
  links: z.array(z.string()),
});
export type CaughtMail = z.infer<typeof caughtMailSchema>;
