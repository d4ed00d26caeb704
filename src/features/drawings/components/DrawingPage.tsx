import { useState } from "react";
import type {
  DrawingDetail,
  DrawingRevisionView,
  DrawingTaskView,
} from "../../../../shared/schemas";
import { MAX_REVISION_LETTER } from "../../../../shared/schemas";
import {
  BookingStateBadge,
  Button,
  buttonClasses,
  CautionNote,
  EmptyState,
  ErrorState,
  FormError,
  LoadingState,
  Notice,
  PageHeader,
  PartyChip,
  Section,
  StatusBadge,
} from "../../../components/ui";
import { errorMessage, isApiError } from "../../../lib/api-client";
import {
  formatDateRange,
  formatDateShort,
  formatTime,
} from "../../../lib/format";
import { useDeleteDrawing } from "../api/delete-drawing";
import { useDrawing } from "../api/get-drawing";
import { useUpdateDrawing } from "../api/update-drawing";
import {
  shareValueOf,
  sharingText,
  type ShareOptions,
  type ShareValue,
} from "../share";
import { formatBytes, previewKind, readinessText, typeLabel } from "../words";
import { KindChip, RevLabel } from "./KindChip";
import { PdfPreview } from "./PdfPreview";
import { RevisionUploadForm } from "./RevisionUploadForm";
import { ShareFields } from "./ShareFields";

interface DrawingPageProps {
  drawingId: string;
  /** Who on the job it can be shared with (from the job, gathered by the route). */
  shareOptions: ShareOptions;
  /** A linked task's safety caution, when it has hazards (from the job's task briefs). */
  cautionFor: (taskId: string) => string | null;
  onDeleted: () => void;
  /** The customer sees a booking as a visit (Words table), confirmed or to be confirmed. */
  asCustomer?: boolean;
}

const nextLetter = (letter: string) =>
  letter >= MAX_REVISION_LETTER
    ? null
    : String.fromCharCode(letter.charCodeAt(0) + 1);

const when = (iso: string) => `${formatDateShort(iso)}, ${formatTime(iso)}`;

/** One drawing: its preview, every revision, who it is shared with, and the tasks it is for. */
export function DrawingPage({
  drawingId,
  shareOptions,
  cautionFor,
  onDeleted,
  asCustomer = false,
}: DrawingPageProps) {
  const drawing = useDrawing(drawingId);
  const [shown, setShown] = useState<string | null>(null);
  const [revising, setRevising] = useState(false);
  const [uploaded, setUploaded] = useState<string | null>(null);

  if (drawing.isPending) return <LoadingState label="Loading the drawing…" />;
  if (drawing.isError) {
    const missing =
      isApiError(drawing.error) &&
      [400, 403, 404].includes(drawing.error.status);
    return (
      <>
        <PageHeader title={missing ? "Drawing not found" : "Drawing"} />
        <ErrorState
          error={drawing.error}
          title={missing ? "There's no drawing here you can see" : undefined}
          onRetry={() => drawing.refetch()}
        />
      </>
    );
  }

  const d = drawing.data;
  const current = d.revisions[0];
  const showing =
    d.revisions.find((r) => r.letter === shown) ?? current ?? null;
  const next = nextLetter(d.currentRevision);

  return (
    <>
      <PageHeader
        title={d.title}
        eyebrow={
          <span className="flex flex-wrap items-center gap-2">
            <span>{d.jobTitle}</span>
            <span aria-hidden="true">·</span>
            <KindChip kind={d.kind} />
            <RevLabel letter={d.currentRevision} current />
          </span>
        }
        description={`Rev ${d.currentRevision} is current; updated ${when(d.updatedAt)}.`}
      />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="flex min-w-0 flex-col gap-6">
          <Section
            title={showing ? `Preview, Rev ${showing.letter}` : "Preview"}
            id="drawing-preview"
            description={
              showing && showing.letter !== d.currentRevision
                ? `An earlier revision: Rev ${d.currentRevision} is current.`
                : undefined
            }
          >
            {showing ? (
              <Preview revision={showing} title={d.title} />
            ) : (
              <EmptyState title="No file yet" />
            )}
          </Section>
          <LinkedTasks
            tasks={d.tasks}
            cautionFor={cautionFor}
            asCustomer={asCustomer}
          />
        </div>
        <div className="flex min-w-0 flex-col gap-6">
          <Section
            title="Revisions"
            id="drawing-revisions"
            actions={
              d.can.addRevision && next && !revising ? (
                <Button
                  size="sm"
                  onClick={() => {
                    setUploaded(null);
                    setRevising(true);
                  }}
                >
                  Upload Rev {next}
                </Button>
              ) : null
            }
          >
            <div className="flex flex-col gap-4">
              {uploaded ? (
                <Notice>
                  Rev {uploaded} is uploaded and now current; the earlier
                  revisions stay below.
                </Notice>
              ) : null}
              {d.can.addRevision && !next ? (
                <p className="text-sm text-ink-soft">
                  Rev {MAX_REVISION_LETTER} is the last revision: start a new
                  drawing for further changes.
                </p>
              ) : null}
              {revising && next ? (
                <div className="rounded border border-rule bg-paper p-3">
                  <h3 className="mb-3 font-semibold">Upload Rev {next}</h3>
                  <RevisionUploadForm
                    drawing={d}
                    nextLetter={next}
                    onUploaded={(nd) => {
                      setRevising(false);
                      setShown(null);
                      setUploaded(nd.currentRevision);
                    }}
                    onCancel={() => setRevising(false)}
                  />
                </div>
              ) : null}
              <ol
                aria-label="Revisions, newest first"
                className="flex flex-col divide-y divide-rule"
              >
                {d.revisions.map((r) => (
                  <RevisionItem
                    key={r.letter}
                    revision={r}
                    current={r.letter === d.currentRevision}
                    previewing={showing?.letter === r.letter}
                    onPreview={() => setShown(r.letter)}
                  />
                ))}
              </ol>
            </div>
          </Section>
          {d.sharing ? (
            <SharingSection drawing={d} options={shareOptions} />
          ) : null}
          {d.can.delete ? (
            <DeleteDrawing drawing={d} onDeleted={onDeleted} />
          ) : null}
        </div>
      </div>
    </>
  );
}

function Preview({
  revision: r,
  title,
}: {
  revision: DrawingRevisionView;
  title: string;
}) {
  const kind = previewKind(r.file.mimeType);
  const download = (
    <a
      href={r.downloadUrl}
      download
      className={buttonClasses("secondary", "sm")}
    >
      Download ({typeLabel(r.file.mimeType)})
    </a>
  );
  if (kind === "image" && (r.thumbnailUrl || r.previewUrl)) {
    return (
      <div className="flex flex-col gap-3">
        <a
          href={r.previewUrl ?? r.downloadUrl}
          target="_blank"
          rel="noopener"
          className="block w-fit max-w-full rounded border border-rule bg-paper"
        >
          <img
            src={r.thumbnailUrl ?? r.previewUrl ?? ""}
            alt={`${title}, Rev ${r.letter}${r.note ? `: ${r.note}` : ""}`}
            width={r.file.width ?? undefined}
            height={r.file.height ?? undefined}
            className="block h-auto max-h-[480px] w-auto max-w-full"
          />
        </a>
        <div className="flex flex-wrap gap-2">
          <a
            href={r.previewUrl ?? r.downloadUrl}
            target="_blank"
            rel="noopener"
            className={buttonClasses("secondary", "sm")}
          >
            Open full size
          </a>
          {download}
        </div>
      </div>
    );
  }
  if (kind === "pdf") {
    return (
      <div className="flex flex-col gap-3">
        <PdfPreview
          key={r.previewUrl ?? r.downloadUrl}
          url={r.previewUrl ?? r.downloadUrl}
          title={`${title}, Rev ${r.letter}`}
        />
        <div className="flex flex-wrap gap-2">{download}</div>
      </div>
    );
  }
  return (
    <div className="flex flex-col items-start gap-3">
      <p className="text-sm text-ink-soft">
        {kind === "dxf"
          ? "DXF drawings open in a CAD program; Sitecue does not draw them here."
          : "This file is not shown here."}
      </p>
      {download}
    </div>
  );
}

function RevisionItem({
  revision: r,
  current,
  previewing,
  onPreview,
}: {
  revision: DrawingRevisionView;
  current: boolean;
  previewing: boolean;
  onPreview: () => void;
}) {
  const by = r.uploadedBy;
  return (
    <li className="flex flex-col gap-1.5 py-3 first:pt-0 last:pb-0">
      <div className="flex flex-wrap items-center gap-2">
        <RevLabel letter={r.letter} current={current} />
        {current ? (
          <span className="text-xs font-medium text-accent-strong">
            Current
          </span>
        ) : null}
        <span className="font-mono text-sm">{when(r.uploadedAt)}</span>
      </div>
      <p className="text-sm">
        {by.name}
        {by.role === "trade" && by.tradeName ? (
          <span className="text-ink-soft">, {by.tradeName}</span>
        ) : (
          <span className="text-ink-soft">, workshop</span>
        )}
      </p>
      {r.note ? (
        <p className="whitespace-pre-line text-sm text-ink">{r.note}</p>
      ) : null}
      <p className="break-all text-sm text-ink-soft">
        {r.file.name}{" "}
        <span className="font-mono">
          ({typeLabel(r.file.mimeType)}, {formatBytes(r.file.sizeBytes)})
        </span>
      </p>
      <div className="flex flex-wrap gap-x-4 gap-y-1">
        <a
          href={r.downloadUrl}
          download
          className="text-sm font-medium text-accent underline underline-offset-2"
        >
          Download Rev {r.letter}
        </a>
        {!previewing ? (
          <Button variant="quiet" size="sm" onClick={onPreview}>
            Show Rev {r.letter}
          </Button>
        ) : null}
      </div>
    </li>
  );
}

const readinessTone = {
  done: "ok",
  started: "accent",
  clear: "ok",
  waiting: "wait",
} as const;

function LinkedTasks({
  tasks,
  cautionFor,
  asCustomer,
}: {
  tasks: DrawingTaskView[];
  cautionFor: (taskId: string) => string | null;
  asCustomer: boolean;
}) {
  return (
    <Section
      title="Tasks it is for"
      id="drawing-tasks"
      description="When each can start, from the job's programme."
    >
      {tasks.length === 0 ? (
        <EmptyState title="Not linked to a task you can see" />
      ) : (
        <ul
          aria-label="Linked tasks"
          className="flex flex-col divide-y divide-rule"
        >
          {tasks.map((t) => {
            const caution = cautionFor(t.id);
            const headingId = `linked-task-${t.id}`;
            return (
              <li
                key={t.id}
                aria-labelledby={headingId}
                className="flex flex-col gap-2 py-3 first:pt-0 last:pb-0"
              >
                <div className="flex flex-wrap items-center gap-x-3 gap-y-1.5">
                  <h3 id={headingId} className="font-semibold">
                    {t.name}
                  </h3>
                  <PartyChip party={t.party} />
                </div>
                <p className="text-sm text-ink-soft">
                  Planned{" "}
                  <span className="font-mono text-ink">
                    {formatDateRange(t.plannedStart, t.plannedFinish)}
                  </span>
                </p>
                <div>
                  {t.readiness.state === "waiting" ? (
                    // Not a StatusBadge: the names can be long, so it wraps on a phone.
                    <span className="inline-flex max-w-full items-start gap-1.5 rounded border border-wait/40 bg-wait-wash px-2 py-0.5 text-sm font-medium text-ink">
                      <span
                        aria-hidden="true"
                        className="mt-1.5 size-2 shrink-0 rounded-full bg-wait"
                      />
                      <span>{readinessText(t)}</span>
                    </span>
                  ) : (
                    <StatusBadge tone={readinessTone[t.readiness.state]}>
                      {readinessText(t)}
                    </StatusBadge>
                  )}
                </div>
                {t.booking ? (
                  <p className="flex flex-wrap items-center gap-2 text-sm">
                    <span className="text-ink-soft">
                      {asCustomer ? "Visit:" : "Booked:"}
                    </span>
                    <span>{t.booking.tradeName}</span>
                    <BookingStateBadge
                      state={t.booking.state}
                      asVisit={asCustomer}
                    />
                  </p>
                ) : null}
                {caution ? <CautionNote>{caution}</CautionNote> : null}
              </li>
            );
          })}
        </ul>
      )}
    </Section>
  );
}

function SharingSection({
  drawing: d,
  options,
}: {
  drawing: DrawingDetail;
  options: ShareOptions;
}) {
  const [editing, setEditing] = useState(false);
  const [value, setValue] = useState<ShareValue | null>(null);
  const update = useUpdateDrawing(d.jobId, d.id);
  const sharing = d.sharing!;
  const start = () => {
    update.reset();
    setValue(shareValueOf(sharing));
    setEditing(true);
  };
  return (
    <Section
      title="Shared with"
      id="drawing-sharing"
      actions={
        d.can.edit && !editing ? (
          <Button variant="secondary" size="sm" onClick={start}>
            Change sharing
          </Button>
        ) : null
      }
    >
      {editing && value ? (
        <form
          aria-label="Change sharing"
          noValidate
          className="flex flex-col gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            update.mutate(
              {
                shareTradeKinds: value.tradeKinds,
                shareTradeIds: value.tradeIds,
                shareWithCustomer: value.customer,
              },
              { onSuccess: () => setEditing(false) },
            );
          }}
        >
          <ShareFields
            options={withCurrent(options, sharing)}
            value={value}
            onChange={setValue}
            disabled={update.isPending}
          />
          <FormError
            message={update.isError ? errorMessage(update.error) : null}
          />
          <div className="flex flex-wrap gap-2">
            <Button type="submit" busy={update.isPending}>
              Save sharing
            </Button>
            <Button variant="secondary" onClick={() => setEditing(false)}>
              Cancel
            </Button>
          </div>
        </form>
      ) : (
        <p className="text-sm">{sharingText(sharing)}</p>
      )}
    </Section>
  );
}

/** A trade shared with earlier may have left the job: keep them in the list so they can be unticked. */
function withCurrent(
  options: ShareOptions,
  sharing: NonNullable<DrawingDetail["sharing"]>,
): ShareOptions {
  const trades = [...options.trades];
  for (const t of sharing.trades)
    if (!trades.some((x) => x.id === t.id)) trades.push(t);
  const kinds = [...options.tradeKinds];
  for (const k of sharing.tradeKinds) if (!kinds.includes(k)) kinds.push(k);
  return {
    tradeKinds: kinds,
    trades,
    customerName:
      options.customerName ?? (sharing.customer ? "The customer" : null),
  };
}

function DeleteDrawing({
  drawing: d,
  onDeleted,
}: {
  drawing: DrawingDetail;
  onDeleted: () => void;
}) {
  const [asking, setAsking] = useState(false);
  const remove = useDeleteDrawing(d.jobId, d.id);
  if (!asking)
    return (
      <div>
        <Button variant="quiet-danger" onClick={() => setAsking(true)}>
          Delete this drawing
        </Button>
      </div>
    );
  return (
    <div
      role="group"
      aria-label="Delete this drawing"
      className="flex flex-col gap-3 rounded border border-risk/40 bg-risk-wash p-3"
    >
      <p className="text-sm">
        Delete “{d.title}” and all {d.revisions.length}{" "}
        {d.revisions.length === 1 ? "revision" : "revisions"}? Nobody will be
        able to download them again.
      </p>
      <FormError message={remove.isError ? errorMessage(remove.error) : null} />
      <div className="flex flex-wrap gap-2">
        <Button
          variant="danger"
          busy={remove.isPending}
          onClick={() => remove.mutate(undefined, { onSuccess: onDeleted })}
        >
          Delete drawing
        </Button>
        <Button variant="secondary" onClick={() => setAsking(false)}>
          Keep it
        </Button>
      </div>
    </div>
  );
}
