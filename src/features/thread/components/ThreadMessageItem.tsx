import type {
  ThreadAttachment,
  ThreadMessage,
} from "../../../../shared/schemas";
import { cx } from "../../../components/ui";
import { formatDateShort, formatTime } from "../../../lib/format";
import { withQuery } from "../api/paths";
import { formatFileSize } from "../format-size";
import { linkify } from "../linkify";
import { AudienceChip } from "./AudienceChip";

/** Plain text with its web links as links; React escapes the rest, so no HTML is ever made. */
function MessageText({ text }: { text: string }) {
  return (
    <p className="whitespace-pre-wrap break-words">
      {linkify(text).map((piece, i) =>
        piece.kind === "link" ? (
          <a
            key={i}
            href={piece.href}
            target="_blank"
            // The page opened must not reach back into Sitecue (window.opener) nor learn the
            // thread's address from the Referer header.
            rel="noopener noreferrer"
            className="break-all text-accent underline underline-offset-2"
          >
            {piece.text}
          </a>
        ) : (
          <span key={i}>{piece.text}</span>
        ),
      )}
    </p>
  );
}

function Attachment({ file }: { file: ThreadAttachment }) {
  const size = formatFileSize(file.sizeBytes);
  if (file.hasThumbnail && file.thumbnailUrl) {
    return (
      <li>
        <a
          href={withQuery(file.url, { inline: 1 })}
          target="_blank"
          rel="noopener noreferrer"
          className="group inline-flex max-w-full flex-col gap-1 text-sm"
        >
          <img
            src={file.thumbnailUrl}
            alt={file.name}
            loading="lazy"
            width={file.width ?? undefined}
            height={file.height ?? undefined}
            className="h-auto max-h-48 w-auto max-w-full rounded border border-rule bg-paper object-contain"
          />
          <span className="truncate text-ink-soft group-hover:underline">
            {file.name} · {size}
          </span>
        </a>
      </li>
    );
  }
  return (
    <li>
      <a
        href={file.url}
        download={file.name}
        className="inline-flex max-w-full items-center gap-2 rounded border border-rule-strong bg-paper px-3 py-2 text-sm hover:border-ink-soft"
      >
        <span aria-hidden="true" className="font-mono text-xs text-ink-soft">
          ↓
        </span>
        <span className="min-w-0 truncate font-medium text-accent underline underline-offset-2">
          {file.name}
        </span>
        <span className="shrink-0 text-ink-soft">{size}</span>
      </a>
    </li>
  );
}

function When({ at }: { at: string }) {
  return (
    <time dateTime={at} className="whitespace-nowrap text-ink-soft">
      {formatDateShort(at)}, {formatTime(at)}
    </time>
  );
}

interface ThreadMessageItemProps {
  message: ThreadMessage;
  /** The first unread message carries the "New" divider above it. */
  firstUnread: boolean;
}

export function ThreadMessageItem({
  message: m,
  firstUnread,
}: ThreadMessageItemProps) {
  const divider = firstUnread ? (
    <div
      className="mb-3 flex items-center gap-2 text-xs font-semibold tracking-wide text-risk uppercase"
      data-thread-new=""
    >
      <span aria-hidden="true" className="h-px flex-1 bg-risk/50" />
      <span>New</span>
      <span aria-hidden="true" className="h-px flex-1 bg-risk/50" />
    </div>
  ) : null;

  if (m.kind === "system") {
    // Sitecue's own notes (a booking or the programme changed): quiet, no author.
    return (
      <li className="px-1 py-1">
        {divider}
        <div className="flex flex-col gap-1 border-l-2 border-rule-strong pl-3 text-sm text-ink-soft">
          <div className="flex flex-wrap items-center gap-x-2 gap-y-1 text-xs">
            <span className="font-medium">Sitecue</span>
            <When at={m.createdAt} />
            <AudienceChip audience={m.audience} />
          </div>
          <MessageText text={m.text} />
        </div>
      </li>
    );
  }

  return (
    <li>
      {divider}
      <div
        className={cx(
          "flex flex-col gap-2 rounded border px-3 py-2.5",
          m.mine ? "border-accent/25 bg-accent-wash" : "border-rule bg-card",
        )}
      >
        <div className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1">
          <p className="min-w-0 text-sm">
            <span className="font-semibold">{m.author?.name ?? "Someone"}</span>
            {m.author ? (
              <span className="text-ink-soft"> · {m.author.label}</span>
            ) : null}
            {m.mine ? <span className="text-ink-soft"> (you)</span> : null}
          </p>
          <AudienceChip audience={m.audience} />
        </div>
        {m.text ? <MessageText text={m.text} /> : null}
        {m.attachments.length > 0 ? (
          <ul
            aria-label="Attachments"
            className="flex flex-wrap items-start gap-2"
          >
            {m.attachments.map((f) => (
              <Attachment key={f.id} file={f} />
            ))}
          </ul>
        ) : null}
        <p className="text-xs">
          <When at={m.createdAt} />
        </p>
      </div>
    </li>
  );
}
