import {
  ALLOWED_UPLOAD_LABELS,
  ALLOWED_UPLOAD_TYPES,
  type DrawingTaskView,
} from "../../../shared/schemas";
import { formatDateShort } from "../../lib/format";

/**
 * The server's upload limit when UPLOAD_MAX_BYTES is not set (files module: 25 MB). The client
 * checks against it first so a too-large file is refused before it is sent; the server's own
 * limit still decides, and its message is shown when it refuses.
 */
export const UPLOAD_MAX_BYTES = 25 * 1024 * 1024;

/** "25 MB", as the server writes its limit. */
export function megabytes(n: number): string {
  return `${Math.round((n / (1024 * 1024)) * 10) / 10} MB`;
}

/** "840 KB", "3.2 MB": a file's size for a person. */
export function formatBytes(n: number): string {
  if (n < 1024) return `${n} bytes`;
  if (n < 1024 * 1024) return `${Math.round(n / 1024)} KB`;
  return megabytes(n);
}

const byExtension = new Map<string, string>([
  ...ALLOWED_UPLOAD_TYPES.map((t) => [t.extension, t.label] as const),
  ["jpeg", "JPEG"],
]);
const byMime = new Map<string, string>(
  ALLOWED_UPLOAD_TYPES.map((t) => [t.mimeType, t.label] as const),
);

/**
 * The check before sending, in the server's words ("… is larger than the 25 MB limit.",
 * "Sitecue accepts PDF, PNG, …"). The browser only knows the name and its own guess at the
 * type; the server sniffs the content and may still refuse ("plan.pdf is not a PDF…").
 */
export function checkUploadFile(
  file: File,
  maxBytes = UPLOAD_MAX_BYTES,
): string | null {
  const accepted = `Sitecue accepts ${ALLOWED_UPLOAD_LABELS}.`;
  if (file.size === 0) return `${file.name} is empty.`;
  if (file.size > maxBytes)
    return `${file.name} is larger than the ${megabytes(maxBytes)} limit.`;
  const extension = /\.([^.]+)$/.exec(file.name)?.[1]?.toLowerCase() ?? "";
  if (extension === "svg" || file.type === "image/svg+xml")
    return `${file.name} is an SVG image. SVG files can carry scripts, so Sitecue does not accept them: export it as PDF or PNG. ${accepted}`;
  if (byExtension.has(extension) || byMime.has(file.type)) return null;
  return `${file.name} was refused: it is not a type Sitecue accepts. ${accepted}`;
}

/** How the preview treats a stored type. */
export function previewKind(
  mimeType: string,
): "pdf" | "image" | "dxf" | "other" {
  if (mimeType === "application/pdf") return "pdf";
  if (mimeType.startsWith("image/") && mimeType !== "image/vnd.dxf")
    return "image";
  if (mimeType === "image/vnd.dxf") return "dxf";
  return "other";
}

/** The label of a stored type ("PDF", "DXF"). */
export function typeLabel(mimeType: string): string {
  return byMime.get(mimeType) ?? mimeType;
}

/**
 * A linked task's readiness in the brief's words: "Done", "Started", "Clear to start from
 * Thu 14 Jan", "Waiting on Fix carcasses & scribes (planned Wed 13 Jan)".
 */
export function readinessText(task: DrawingTaskView): string {
  const r = task.readiness;
  switch (r.state) {
    case "done":
      return "Done";
    case "started":
      return "Started";
    case "clear":
      return `Clear to start from ${formatDateShort(r.clearFrom ?? task.plannedStart)}`;
    case "waiting":
      return `Waiting on ${r.waitingOn
        .map((w) =>
          w.plannedFinish
            ? `${w.name} (planned ${formatDateShort(w.plannedFinish)})`
            : w.name,
        )
        .join(", ")}`;
  }
}
