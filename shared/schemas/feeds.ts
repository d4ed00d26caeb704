import { z } from "zod";
import { isoDateSchema } from "./common";

/** GET /api/me/feed: only the token's hash is stored, so the URL itself is never shown again. */
export const feedStatusResponseSchema = z.object({
  exists: z.boolean(),
  /** When the current URL was made (ISO instant), or null without one. */
  createdAt: z.string().nullable(),
});
export type FeedStatusResponse = z.infer<typeof feedStatusResponseSchema>;

/** POST /api/me/feed: the new secret URL, shown this once. */
export const feedCreatedResponseSchema = z.object({ url: z.string() });
export type FeedCreatedResponse = z.infer<typeof feedCreatedResponseSchema>;

/** GET /api/feeds/:token — the token, with an optional ".ics" so calendar apps recognise the URL. */
export const feedTokenParamsSchema = z.object({
  token: z.string().max(100),
});

/** A trade's days off, entered once for every workshop they work for. */
export const daysOffBodySchema = z.object({
  daysOff: z.array(isoDateSchema).max(366),
});
export type DaysOffBody = z.infer<typeof daysOffBodySchema>;

export const daysOffResponseSchema = z.object({
  daysOff: z.array(z.string()),
});
export type DaysOffResponse = z.infer<typeof daysOffResponseSchema>;
