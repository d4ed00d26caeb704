import type { CreateDrawingFields } from "../../../../shared/schemas";
import { jobDrawingsPath } from "./paths";
import type { UploadVars } from "./drawing-upload";

/**
 * The multipart body of POST /jobs/:jobId/drawings: the text fields first, then `file`, so the
 * server has the fields before the file streams in. Lists are repeated fields.
 */
export function createDrawingUpload(
  jobId: string,
  file: File,
  fields: CreateDrawingFields,
): UploadVars {
  const form = new FormData();
  form.append("title", fields.title);
  form.append("kind", fields.kind);
  form.append("note", fields.note ?? "");
  for (const id of listOf(fields.taskIds)) form.append("taskIds", id);
  for (const k of listOf(fields.shareTradeKinds))
    form.append("shareTradeKinds", k);
  for (const id of listOf(fields.shareTradeIds))
    form.append("shareTradeIds", id);
  form.append(
    "shareWithCustomer",
    fields.shareWithCustomer === true ||
      fields.shareWithCustomer === "true" ||
      fields.shareWithCustomer === "on" ||
      fields.shareWithCustomer === "1"
      ? "true"
      : "false",
  );
  form.append("file", file, file.name);
  return { url: jobDrawingsPath(jobId), form };
}

function listOf(v: string | string[] | undefined): string[] {
  return v === undefined ? [] : Array.isArray(v) ? v : [v];
}
