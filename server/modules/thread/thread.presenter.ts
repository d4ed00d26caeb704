import type {
  ThreadAttachment as ThreadAttachmentView,
  ThreadMessage as ThreadMessageView,
} from "../../../shared/schemas";
import type { StoredFile } from "../files/files.entity";
import type { ThreadMessage } from "./thread.entity";

export function attachmentUrl(jobId: string, fileId: string): string {
  return `/api/jobs/${jobId}/thread/attachments/${fileId}`;
}

export function presentAttachment(
  jobId: string,
  f: StoredFile,
): ThreadAttachmentView {
  const url = attachmentUrl(jobId, f.id);
  return {
    id: f.id,
    name: f.originalName,
    mimeType: f.mimeType,
    sizeBytes: f.sizeBytes,
    hasThumbnail: f.thumbnailKey !== null,
    width: f.width,
    height: f.height,
    url,
    thumbnailUrl: f.thumbnailKey ? `${url}?variant=thumbnail` : null,
  };
}

/** One message for one person: `mine` and `unread` are theirs. Text goes out exactly as stored. */
export function presentMessage(
  msg: ThreadMessage,
  files: StoredFile[],
  viewer: { userId: string; lastReadSeq: number },
): ThreadMessageView {
  const seq = Number(msg.seq);
  const mine = msg.authorUserId !== null && msg.authorUserId === viewer.userId;
  return {
    id: msg.id,
    seq,
    kind: msg.kind,
    audience: msg.audience,
    text: msg.text,
    author:
      msg.kind === "system" || !msg.authorRole
        ? null
        : {
            name: msg.authorName ?? "",
            label: msg.authorLabel ?? "",
            role: msg.authorRole,
          },
    mine,
    createdAt: msg.createdAt.toISOString(),
    unread: !mine && seq > viewer.lastReadSeq,
    attachments: files.map((f) => presentAttachment(msg.jobId, f)),
  };
}
