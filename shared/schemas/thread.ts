import { z } from "zod";
import { idSchema } from "./common";

// The job thread: one per job, every message in exactly one audience. Text is plain text — the
// client renders it as text (and linkifies URLs); no HTML is ever rendered, so nothing here is
// sanitised: "<b>" is stored and returned as the four characters it is.

/** Who a message is for. Order is widest first (the composer's default is the first allowed). */
export const threadAudiences = ["job", "trades", "workshop"] as const;
export const threadAudienceSchema = z.enum(threadAudiences);
export type ThreadAudience = z.infer<typeof threadAudienceSchema>;

/** The words a person sees for each audience. */
export const threadAudienceLabels: Record<ThreadAudience, string> = {
  job: "Whole job",
  trades: "Trades & workshop",
  workshop: "Workshop only",
};

/** Longest message text, in characters (after trimming). */
export const THREAD_TEXT_MAX = 4000;
/** Most files on one message. */
export const THREAD_MAX_FILES = 5;

export const threadParamsSchema = z.object({ jobId: idSchema });
export const threadAttachmentParamsSchema = z.object({
  jobId: idSchema,
  fileId: idSchema,
});

/** A message's position in the thread: a number that only grows (the `seq` of each message). */
const cursorSchema = z.coerce
  .number({ message: "Must be a message position" })
  .int("Must be a message position")
  .min(0, "Must be a message position");

/**
 * `GET /jobs/:jobId/thread`.
 * - no query: the latest `limit` messages the person may see;
 * - `after=<cursor>`: only messages after that position (the cheap poll, every few seconds);
 * - `before=<seq>`: the `limit` messages just before it (scrolling back).
 */
export const threadQuerySchema = z.object({
  after: cursorSchema.optional(),
  before: cursorSchema.optional(),
  limit: z.coerce.number().int().min(1).max(200).default(100),
});
/** What a client sends (z.input of a coerced field is `unknown`, so spelled out). */
export type ThreadQuery = { after?: number; before?: number; limit?: number };

/** `GET /jobs/:jobId/thread/attachments/:fileId` — `variant=thumbnail` for an image's preview, `inline=1` to view in the browser. */
export const threadAttachmentQuerySchema = z.object({
  variant: z.enum(["original", "thumbnail"]).default("original"),
  inline: z
    .enum(["0", "1", "true", "false"])
    .default("0")
    .transform((v) => v === "1" || v === "true"),
});

const textField = z
  .string()
  .trim()
  .max(THREAD_TEXT_MAX, `Keep a message under ${THREAD_TEXT_MAX} characters`);

/** `POST /jobs/:jobId/thread/messages` (JSON, no files): text is required. */
export const postMessageBodySchema = z.object({
  audience: threadAudienceSchema,
  text: textField.min(1, "Write a message"),
});
export type PostMessageBody = z.input<typeof postMessageBodySchema>;

/**
 * `POST /jobs/:jobId/thread/messages/upload` (multipart/form-data): these text fields plus 1 to
 * THREAD_MAX_FILES parts named `file` (PDF, PNG, JPEG, WebP, DXF). Text may be empty when files
 * are attached (a site photo needs no caption).
 */
export const postMessageFieldsSchema = z.object({
  audience: threadAudienceSchema,
  text: textField.default(""),
});
export type PostMessageFields = z.input<typeof postMessageFieldsSchema>;

/** `POST /jobs/:jobId/thread/read`: everything up to `seq` is read (default: all the person can see now). Never moves backwards. */
export const markReadBodySchema = z.object({
  seq: z.number().int().min(0).optional(),
});
export type MarkReadBody = z.input<typeof markReadBodySchema>;

/** Who wrote a message, as everyone on the thread sees it — never contact details. */
export const threadAuthorSchema = z.object({
  /** The person's name. */
  name: z.string(),
  /** "Workshop", the trade's business name, or "Customer". */
  label: z.string(),
  role: z.enum(["workshop", "trade", "customer"]),
});
export type ThreadAuthor = z.infer<typeof threadAuthorSchema>;

export const threadAttachmentSchema = z.object({
  id: idSchema,
  name: z.string(),
  /** The type found in the file's content, not the browser's claim. */
  mimeType: z.string(),
  sizeBytes: z.number(),
  hasThumbnail: z.boolean(),
  width: z.number().nullable(),
  height: z.number().nullable(),
  /** Download path under /api (GET; add `?inline=1` to view, `?variant=thumbnail` for the preview). */
  url: z.string(),
  thumbnailUrl: z.string().nullable(),
});
export type ThreadAttachment = z.infer<typeof threadAttachmentSchema>;

export const threadMessageSchema = z.object({
  id: idSchema,
  /** Position in the thread; use the largest one seen as the next `after`. */
  seq: z.number(),
  /** `system` notes are written by Sitecue when a booking or task changes; their author is null. */
  kind: z.enum(["message", "system"]),
  audience: threadAudienceSchema,
  text: z.string(),
  author: threadAuthorSchema.nullable(),
  /** Written by the signed-in person. */
  mine: z.boolean(),
  /** ISO 8601 instant (UTC). */
  createdAt: z.string(),
  /** After the person's read position and not their own. */
  unread: z.boolean(),
  attachments: z.array(threadAttachmentSchema),
});
export type ThreadMessage = z.infer<typeof threadMessageSchema>;

export const threadResponseSchema = z.object({
  jobId: idSchema,
  /** Audiences this person sees, widest first. */
  visibleAudiences: z.array(threadAudienceSchema),
  /** Audiences this person may post to (what the composer offers), widest first; empty = read-only. */
  audiences: z.array(threadAudienceSchema),
  /** Oldest first. With `after`, only the new ones (possibly none). */
  messages: z.array(threadMessageSchema),
  /** More messages exist before the first one returned (ask with `before`). */
  hasEarlier: z.boolean(),
  /** Pass as `after` on the next poll (the largest position seen, or the `after` given). */
  cursor: z.number(),
  /** The person's read position: messages with a larger `seq` are unread. */
  lastReadSeq: z.number(),
  /** Unread messages for this person in the whole thread (not only those returned). */
  unreadCount: z.number(),
});
export type ThreadResponse = z.infer<typeof threadResponseSchema>;

export const markReadResponseSchema = z.object({
  lastReadSeq: z.number(),
  unreadCount: z.number(),
});
export type MarkReadResponse = z.infer<typeof markReadResponseSchema>;

/** `GET /thread/unread`: the signed-in person's jobs with unread messages, newest activity first. */
export const unreadResponseSchema = z.object({
  total: z.number(),
  jobs: z.array(
    z.object({
      jobId: idSchema,
      jobTitle: z.string(),
      unreadCount: z.number(),
      /** ISO instant of the newest unread message. */
      latestAt: z.string(),
    }),
  ),
});
export type UnreadResponse = z.infer<typeof unreadResponseSchema>;

/** Polling interval for new messages while the thread is on screen (see DEVELOPERS.md, Decisions). */
export const THREAD_POLL_MS = 4000;
