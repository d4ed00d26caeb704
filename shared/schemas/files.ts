import { z } from "zod";

/** The file types Sitecue accepts for drawings, templates, site photos and thread attachments. */
export const ALLOWED_UPLOAD_TYPES = [
  { mimeType: "application/pdf", extension: "pdf", label: "PDF" },
  { mimeType: "image/png", extension: "png", label: "PNG" },
  { mimeType: "image/jpeg", extension: "jpg", label: "JPEG" },
  { mimeType: "image/webp", extension: "webp", label: "WebP" },
  { mimeType: "image/vnd.dxf", extension: "dxf", label: "DXF" },
] as const;

/** For an <input type="file" accept>: the types above by MIME type and extension. */
export const UPLOAD_ACCEPT = [
  ...ALLOWED_UPLOAD_TYPES.map((t) => t.mimeType),
  ".pdf",
  ".png",
  ".jpg",
  ".jpeg",
  ".webp",
  ".dxf",
].join(",");

export const ALLOWED_UPLOAD_LABELS = ALLOWED_UPLOAD_TYPES.map(
  (t) => t.label,
).join(", ");

/** An uploaded file as the API shows it (never its storage key). */
export const storedFileViewSchema = z.object({
  id: z.string(),
  name: z.string(),
  mimeType: z.string(),
  sizeBytes: z.number().int(),
  hasThumbnail: z.boolean(),
  width: z.number().int().nullable(),
  height: z.number().int().nullable(),
  uploadedAt: z.string(),
});
export type StoredFileView = z.infer<typeof storedFileViewSchema>;

/** Query for a file download: `inline=1` asks to preview PDFs and images in the browser. */
export const fileDownloadQuerySchema = z.object({
  inline: z.enum(["0", "1"]).optional(),
});
