import { useState } from "react";
import { Link } from "react-router-dom";
import type { DrawingDetail, DrawingSummary } from "../../../../shared/schemas";
import {
  Button,
  EmptyState,
  ErrorState,
  LoadingState,
  Notice,
  Section,
} from "../../../components/ui";
import { formatDateShort, formatTime } from "../../../lib/format";
import { useJobDrawings } from "../api/list-job-drawings";
import { drawingPagePath } from "../api/paths";
import { sharingText, type ShareOptions } from "../share";
import { DrawingUploadForm } from "./DrawingUploadForm";
import { KindChip, RevLabel } from "./KindChip";

interface JobDrawingsProps {
  jobId: string;
  shareOptions: ShareOptions;
  /** The section's id (the job page's `#job-drawings`); a page with several jobs gives each its own. */
  sectionId?: string;
}

/** The job page's drawings, templates and site photos, with the upload for those who may. */
export function JobDrawings({
  jobId,
  shareOptions,
  sectionId = "job-drawings",
}: JobDrawingsProps) {
  const list = useJobDrawings(jobId);
  const [adding, setAdding] = useState(false);
  const [added, setAdded] = useState<DrawingDetail | null>(null);

  const upload = list.data?.upload ?? null;
  const isTrade = upload ? !upload.canShare : false;
  const addLabel = isTrade ? "Add template or photo" : "Upload drawing";

  return (
    <Section
      title="Drawings"
      id={sectionId}
      description={
        isTrade
          ? "Drawings shared with you, and the templates and photos you add."
          : list.data?.upload
            ? "Drawings, templates and site photos, each with its revisions."
            : undefined
      }
      actions={
        upload && !adding ? (
          <Button
            size="sm"
            onClick={() => {
              setAdded(null);
              setAdding(true);
            }}
          >
            {addLabel}
          </Button>
        ) : null
      }
    >
      <div className="flex flex-col gap-4">
        {added ? (
          <Notice>
            {isTrade
              ? `“${added.title}” is added to your task; the workshop sees it.`
              : `Rev ${added.currentRevision} of “${added.title}” is uploaded.`}{" "}
            <Link
              to={drawingPagePath(jobId, added.id)}
              className="text-accent underline underline-offset-2"
            >
              Open it
            </Link>
          </Notice>
        ) : null}
        {adding && upload ? (
          <div className="rounded border border-rule bg-paper p-3 sm:p-4">
            <h3 className="mb-3 font-semibold">{addLabel}</h3>
            <DrawingUploadForm
              jobId={jobId}
              upload={upload}
              shareOptions={shareOptions}
              onUploaded={(d) => {
                setAdding(false);
                setAdded(d);
              }}
              onCancel={() => setAdding(false)}
            />
          </div>
        ) : null}
        {list.isPending ? (
          <LoadingState label="Loading the drawings…" />
        ) : list.isError ? (
          <ErrorState error={list.error} onRetry={() => list.refetch()} />
        ) : list.data.drawings.length === 0 ? (
          <EmptyState title="No drawings yet">
            {upload
              ? isTrade
                ? "Add a template or a site photo to your task; the workshop sees it."
                : "Upload an elevation, a plan or a template; share it with the trades who need it."
              : "When the workshop shares a drawing with you, it appears here."}
          </EmptyState>
        ) : (
          <ul
            className="flex flex-col divide-y divide-rule"
            aria-label="Drawings"
          >
            {list.data.drawings.map((d) => (
              <DrawingItem key={d.id} jobId={jobId} drawing={d} />
            ))}
          </ul>
        )}
      </div>
    </Section>
  );
}

function DrawingItem({
  jobId,
  drawing: d,
}: {
  jobId: string;
  drawing: DrawingSummary;
}) {
  const headingId = `drawing-${d.id}`;
  return (
    <li
      aria-labelledby={headingId}
      className="flex gap-3 py-3 first:pt-0 last:pb-0"
    >
      {d.current.thumbnailUrl ? (
        <img
          src={d.current.thumbnailUrl}
          alt=""
          width={56}
          height={56}
          loading="lazy"
          className="size-14 shrink-0 rounded border border-rule bg-paper object-cover"
        />
      ) : (
        <span
          aria-hidden="true"
          className="flex size-14 shrink-0 items-center justify-center rounded border border-rule bg-paper font-mono text-xs text-ink-soft"
        >
          {d.current.file.name.split(".").pop()?.toUpperCase()}
        </span>
      )}
      <div className="flex min-w-0 flex-col gap-1">
        <div className="flex flex-wrap items-center gap-x-2 gap-y-1">
          <h3 id={headingId} className="font-medium">
            <Link
              to={drawingPagePath(jobId, d.id)}
              className="text-accent underline underline-offset-2"
            >
              {d.title}
            </Link>
          </h3>
          <KindChip kind={d.kind} />
          <RevLabel letter={d.currentRevision} current />
        </div>
        <p className="text-sm text-ink-soft">
          Updated{" "}
          <span className="font-mono text-ink">
            {formatDateShort(d.updatedAt)} {formatTime(d.updatedAt)}
          </span>
          {d.revisionCount > 1 ? <> · {d.revisionCount} revisions</> : null}
        </p>
        {d.tasks.length > 0 ? (
          <p className="text-sm text-ink-soft">
            For:{" "}
            <span className="text-ink">
              {d.tasks.map((t) => t.name).join(", ")}
            </span>
          </p>
        ) : null}
        {d.sharing ? (
          <p className="text-sm text-ink-soft">
            Shared with:{" "}
            <span className="text-ink">{sharingText(d.sharing)}</span>
          </p>
        ) : null}
      </div>
    </li>
  );
}
