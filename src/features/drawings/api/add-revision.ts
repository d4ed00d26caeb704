import { drawingRevisionsPath } from "./paths";
import type { UploadVars } from "./drawing-upload";

/** The multipart body of POST /drawings/:drawingId/revisions: the note, then `file`. */
export function addRevisionUpload(
  drawingId: string,
  file: File,
  note: string,
): UploadVars {
  const form = new FormData();
  form.append("note", note);
  form.append("file", file, file.name);
  return { url: drawingRevisionsPath(drawingId), form };
}
