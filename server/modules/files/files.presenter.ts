import type { StoredFileView } from "../../../shared/schemas/files";
import type { StoredFile } from "./files.entity";

/** A stored file as the API shows it: never its storage key. */
export function presentFile(f: StoredFile): StoredFileView {
  return {
    id: f.id,
    name: f.originalName,
    mimeType: f.mimeType,
    sizeBytes: f.sizeBytes,
    hasThumbnail: f.thumbnailKey !== null,
    width: f.width,
    height: f.height,
    uploadedAt: f.createdAt.toISOString(),
  };
}
