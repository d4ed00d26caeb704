import { z } from "zod";
import {
  bookingStateSchema,
  idSchema,
  partySchema,
  tradeKindSchema,
  tradeKinds,
} from "./common";
import { storedFileViewSchema } from "./files";

/*
 * Drawings, templates and site photos on a job (issue 7). A drawing has revisions Rev A, Rev B …;
 * every revision is kept and stays downloadable. Uploads are multipart (`file` + the text fields
 * below); everything else is JSON.
 *
 * Routes (all under /api):
 *   GET    /jobs/:jobId/drawings                        → jobDrawingsResponseSchema
 *   POST   /jobs/:jobId/drawings              multipart → drawingDetailSchema (201)
 *            fields: createDrawingFieldsSchema
 *   GET    /drawings/:drawingId                         → drawingDetailSchema
 *   PATCH  /drawings/:drawingId               JSON      → drawingDetailSchema
 *            body: updateDrawingBodySchema (workshop only)
 *   DELETE /drawings/:drawingId                         → 204 (owner only; removes every revision's file)
 *   POST   /drawings/:drawingId/revisions     multipart → drawingDetailSchema (201)
 *            fields: addRevisionFieldsSchema
 *   GET    /drawings/:drawingId/revisions/:letter/file       → the file (?inline=1 to preview PDF/images)
 *   GET    /drawings/:drawingId/revisions/:letter/thumbnail  → WebP thumbnail (images only; 404 otherwise)
 */

export const drawingKinds = ["drawing", "template", "site_photo"] as const;
export const drawingKindSchema = z.enum(drawingKinds, {
  message: "Choose drawing, template or site photo",
});
export type DrawingKind = z.infer<typeof drawingKindSchema>;
export const drawingKindLabels: Record<DrawingKind, string> = {
  drawing: "Drawing",
  template: "Template",
  site_photo: "Site photo",
};
/** The kinds a trade may upload (to their own tasks); the workshop may upload any kind. */
export const tradeUploadKinds = [
  "template",
  "site_photo",
] as const satisfies readonly DrawingKind[];

/**
 * Revision letters: A … Z, then refused. Twenty-six revisions of one drawing means it is a new
 * drawing; the server answers 409 "Rev Z is the last revision…" rather than inventing AA.
 */
export const revisionLetterSchema = z
  .string()
  .regex(/^[A-Z]$/, "A revision is a capital letter, A to Z");
export const MAX_REVISION_LETTER = "Z";

export const jobDrawingsParamsSchema = z.object({ jobId: idSchema });
export const drawingParamsSchema = z.object({ drawingId: idSchema });
export const drawingRevisionParamsSchema = z.object({
  drawingId: idSchema,
  letter: revisionLetterSchema,
});
/** `?inline=1` asks for Content-Disposition inline (PDF, PNG, JPEG, WebP only; others stay attachment). */
export const drawingFileQuerySchema = z.object({
  inline: z
    .enum(["0", "1", "true", "false"])
    .optional()
    .transform((v) => v === "1" || v === "true"),
});

/** A multipart text field given once, repeated, or comma-separated: always a list of trimmed strings. */
const listField = z
  .union([z.string(), z.array(z.string())])
  .optional()
  .transform((v) =>
    (v === undefined ? [] : Array.isArray(v) ? v : [v])
      .flatMap((s) => s.split(","))
      .map((s) => s.trim())
      .filter((s) => s.length > 0),
  );
const idListField = listField.pipe(
  z.array(idSchema).max(50, "At most 50 at once"),
);
const tradeKindListField = listField.pipe(
  z.array(z.enum(tradeKinds, { message: "Not a trade kind" })).max(10),
);
/** A multipart checkbox: "true"/"1"/"on" is yes; absent, "", "false" or "0" is no. */
const boolField = z
  .union([z.boolean(), z.enum(["true", "false", "1", "0", "on", ""])])
  .optional()
  .transform((v) => v === true || v === "true" || v === "1" || v === "on");

const titleSchema = z
  .string()
  .trim()
  .min(1, "Give it a short title, like “Elevation, alcoves”")
  .max(160, "Keep the title under 160 characters");
const noteSchema = z
  .string()
  .trim()
  .max(1000, "Keep the note under 1000 characters");

/**
 * Text fields of POST /jobs/:jobId/drawings (multipart, with one `file`). `taskIds`: at least one
 * task of the job (a trade: only their own tasks). Sharing: trade kinds, named trades on the job,
 * the customer; the workshop always sees everything. A trade's upload is shared with the workshop
 * and the uploader regardless of these fields (a trade's sharing fields are ignored).
 */
export const createDrawingFieldsSchema = z.object({
  title: titleSchema,
  kind: drawingKindSchema,
  note: noteSchema.default(""),
  taskIds: idListField.pipe(
    z.array(idSchema).min(1, "Choose the task this is for"),
  ),
  shareTradeKinds: tradeKindListField,
  shareTradeIds: idListField,
  shareWithCustomer: boolField,
});
export type CreateDrawingFields = z.input<typeof createDrawingFieldsSchema>;

/** Text fields of POST /drawings/:drawingId/revisions (multipart, with one `file`). */
export const addRevisionFieldsSchema = z.object({
  note: noteSchema.min(1, "Say what changed in this revision"),
});
export type AddRevisionFields = z.input<typeof addRevisionFieldsSchema>;

/** PATCH /drawings/:drawingId (workshop only). Omitted fields stay as they are; lists replace. */
export const updateDrawingBodySchema = z
  .object({
    title: titleSchema.optional(),
    taskIds: z
      .array(idSchema)
      .min(1, "Choose the task this is for")
      .max(50)
      .optional(),
    shareTradeKinds: z.array(tradeKindSchema).max(10).optional(),
    shareTradeIds: z.array(idSchema).max(50).optional(),
    shareWithCustomer: z.boolean().optional(),
  })
  .refine((b) => Object.values(b).some((v) => v !== undefined), {
    message: "Say what changes",
  });
export type UpdateDrawingBody = z.input<typeof updateDrawingBodySchema>;

/** The stored file of one revision: the files module's view. */
export const drawingFileViewSchema = storedFileViewSchema;

export const drawingRevisionViewSchema = z.object({
  letter: revisionLetterSchema,
  note: z.string(),
  uploadedBy: z.object({
    name: z.string(),
    /** "workshop" for the owner or a fitter; "trade" with their business name (customers cannot upload). */
    role: z.enum(["workshop", "trade"]),
    tradeName: z.string().nullable(),
  }),
  uploadedAt: z.string(),
  file: drawingFileViewSchema,
  /** GET …/revisions/:letter/file: a download (attachment). */
  downloadUrl: z.string(),
  /** The same with ?inline=1, only for types a browser shows safely (PDF, PNG, JPEG, WebP). */
  previewUrl: z.string().nullable(),
  /** GET …/revisions/:letter/thumbnail, when the server made one. */
  thumbnailUrl: z.string().nullable(),
});
export type DrawingRevisionView = z.infer<typeof drawingRevisionViewSchema>;

/** Who a drawing is shared with (shown to the workshop only). */
export const drawingSharingSchema = z.object({
  tradeKinds: z.array(tradeKindSchema),
  trades: z.array(
    z.object({ id: idSchema, name: z.string(), kind: tradeKindSchema }),
  ),
  customer: z.boolean(),
});
export type DrawingSharing = z.infer<typeof drawingSharingSchema>;

/**
 * A linked task with the programme engine's own readiness (the same results the programme page
 * shows), left to the client to word: done → "Done"; started → "Started"; clear → "Clear to start
 * from <clearFrom>"; waiting → "Waiting on <name> (planned <plannedFinish>)…".
 */
export const drawingTaskViewSchema = z.object({
  id: idSchema,
  name: z.string(),
  party: partySchema,
  plannedStart: z.string(),
  plannedFinish: z.string(),
  readiness: z.object({
    state: z.enum(["done", "started", "clear", "waiting"]),
    /** When state is "clear": the planned start (the engine's earliest the task can start). */
    clearFrom: z.string().nullable(),
    waitingOn: z.array(
      z.object({
        taskId: idSchema,
        name: z.string(),
        plannedFinish: z.string().nullable(),
        /** When that task lets this one start (from the engine's readiness). */
        allowsFrom: z.string(),
      }),
    ),
  }),
  /** The booked trade, as the viewer may see it: the workshop always; a trade only their own booking; the customer sent-or-later bookings. No contact details. */
  booking: z
    .object({
      tradeId: idSchema,
      tradeName: z.string(),
      tradeKind: tradeKindSchema,
      state: bookingStateSchema,
    })
    .nullable(),
});
export type DrawingTaskView = z.infer<typeof drawingTaskViewSchema>;

/** One line of a job's drawings list. */
export const drawingSummarySchema = z.object({
  id: idSchema,
  jobId: idSchema,
  title: z.string(),
  kind: drawingKindSchema,
  currentRevision: revisionLetterSchema,
  revisionCount: z.number(),
  updatedAt: z.string(),
  current: drawingRevisionViewSchema,
  tasks: z.array(z.object({ id: idSchema, name: z.string() })),
  /** Workshop only; null for trades and the customer. */
  sharing: drawingSharingSchema.nullable(),
});
export type DrawingSummary = z.infer<typeof drawingSummarySchema>;

/** GET /jobs/:jobId/drawings: the drawings the viewer may see, newest change first. */
export const jobDrawingsResponseSchema = z.object({
  jobId: idSchema,
  /** What the viewer may upload here: null for the customer; a trade gets template/site photo and their own tasks. */
  upload: z
    .object({
      kinds: z.array(drawingKindSchema),
      tasks: z.array(z.object({ id: idSchema, name: z.string() })),
      /** The workshop may share; a trade's upload goes to the workshop (and them). */
      canShare: z.boolean(),
    })
    .nullable(),
  drawings: z.array(drawingSummarySchema),
});
export type JobDrawingsResponse = z.infer<typeof jobDrawingsResponseSchema>;

/** GET /drawings/:drawingId (also the answer to upload, new revision and PATCH). */
export const drawingDetailSchema = z.object({
  id: idSchema,
  jobId: idSchema,
  jobTitle: z.string(),
  title: z.string(),
  kind: drawingKindSchema,
  currentRevision: revisionLetterSchema,
  createdAt: z.string(),
  updatedAt: z.string(),
  /** Workshop only; null for trades and the customer. */
  sharing: drawingSharingSchema.nullable(),
  /** Newest first: revisions[0] is the current one. */
  revisions: z.array(drawingRevisionViewSchema),
  tasks: z.array(drawingTaskViewSchema),
  can: z.object({
    /** PATCH: title, sharing, tasks (workshop). */
    edit: z.boolean(),
    /** POST …/revisions: the workshop, or the trade who made the drawing. */
    addRevision: z.boolean(),
    /** DELETE (owner). */
    delete: z.boolean(),
  }),
});
export type DrawingDetail = z.infer<typeof drawingDetailSchema>;
