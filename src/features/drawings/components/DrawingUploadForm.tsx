import { useEffect, useRef, useState, type FormEvent } from "react";
import {
  createDrawingFieldsSchema,
  drawingKindLabels,
  UPLOAD_ACCEPT,
  type DrawingDetail,
  type DrawingKind,
  type JobDrawingsResponse,
} from "../../../../shared/schemas";
import {
  Button,
  FormError,
  ProgressBar,
  TextArea,
  TextField,
} from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { createDrawingUpload } from "../api/create-drawing";
import { useDrawingUpload } from "../api/drawing-upload";
import { checkUploadFile, megabytes, UPLOAD_MAX_BYTES } from "../words";
import { noSharing, type ShareOptions, type ShareValue } from "../share";
import { CheckGroup, FilePicker, RadioGroup } from "./FilePicker";
import { ShareFields } from "./ShareFields";
import {
  serverFieldErrors,
  zodFieldErrors,
  type FieldErrors,
} from "./form-errors";

type Upload = NonNullable<JobDrawingsResponse["upload"]>;

interface DrawingUploadFormProps {
  jobId: string;
  upload: Upload;
  shareOptions: ShareOptions;
  onUploaded: (drawing: DrawingDetail) => void;
  onCancel: () => void;
}

/**
 * A new drawing, template or site photo. The workshop chooses any kind, the tasks and who it is
 * shared with; a trade (on a phone, on site) takes a photo straight from the camera for their
 * own task, and it goes to the workshop.
 */
export function DrawingUploadForm({
  jobId,
  upload,
  shareOptions,
  onUploaded,
  onCancel,
}: DrawingUploadFormProps) {
  const isTrade = !upload.canShare;
  const kinds = upload.kinds;
  const [file, setFile] = useState<File | null>(null);
  const [title, setTitle] = useState("");
  const [kind, setKind] = useState<DrawingKind>(kinds[0] ?? "drawing");
  const [note, setNote] = useState("");
  const [taskIds, setTaskIds] = useState<string[]>(
    upload.tasks.length === 1 ? [upload.tasks[0].id] : [],
  );
  const [share, setShare] = useState<ShareValue>(noSharing);
  const [errors, setErrors] = useState<FieldErrors>({});
  const send = useDrawingUpload(jobId);
  const busy = send.isPending;
  // The form opens from a button: keyboard users land on its first field.
  const fileInput = useRef<HTMLInputElement>(null);
  useEffect(() => fileInput.current?.focus(), []);

  const serverErrors = send.isError ? serverFieldErrors(send.error) : {};
  const fieldError = (name: string) => errors[name] ?? serverErrors[name];
  const formError = !send.isError
    ? null
    : send.error instanceof DOMException && send.error.name === "AbortError"
      ? "Upload stopped; nothing was saved."
      : errorMessage(send.error);

  const taskName = (id: string) =>
    upload.tasks.find((t) => t.id === id)?.name ?? "";

  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    if (busy) return;
    const found: FieldErrors = {};
    if (!file) found.file = "Choose the file to upload.";
    else {
      const refused = checkUploadFile(file);
      if (refused) found.file = refused;
    }
    // A trade on a phone need not type a title: it reads "Template for Template coving".
    const effectiveTitle =
      title.trim() ||
      (isTrade && taskIds.length > 0
        ? `${drawingKindLabels[kind]} for ${taskIds.map(taskName).join(", ")}`.slice(
            0,
            160,
          )
        : "");
    const parsed = createDrawingFieldsSchema.safeParse({
      title: effectiveTitle,
      kind,
      note,
      taskIds,
      shareTradeKinds: isTrade ? [] : share.tradeKinds,
      shareTradeIds: isTrade ? [] : share.tradeIds,
      shareWithCustomer: isTrade ? false : share.customer,
    });
    if (!parsed.success) Object.assign(found, zodFieldErrors(parsed.error));
    setErrors(found);
    if (Object.keys(found).length > 0 || !file || !parsed.success) return;
    send.mutate(createDrawingUpload(jobId, file, parsed.data), {
      onSuccess: onUploaded,
    });
  };

  const label = isTrade ? "Add template or photo" : "Upload drawing";
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={label}
      className="flex flex-col gap-4"
    >
      <FilePicker
        ref={fileInput}
        label={isTrade ? "Photo or file" : "File"}
        file={file}
        onChange={(f) => {
          setFile(f);
          setErrors((x) => ({
            ...x,
            file: f ? (checkUploadFile(f) ?? undefined) : undefined,
          }));
          if (send.isError) send.reset();
        }}
        // On a phone this offers the back camera first (HTML Media Capture, capture="environment").
        accept={isTrade ? "image/*,application/pdf" : UPLOAD_ACCEPT}
        capture={isTrade ? "environment" : undefined}
        hint={`PDF, PNG, JPEG, WebP${isTrade ? "" : " or DXF"}; up to ${megabytes(UPLOAD_MAX_BYTES)}.`}
        error={fieldError("file")}
        disabled={busy}
      />
      <RadioGroup
        legend="Kind"
        name="kind"
        options={kinds.map((k) => ({ value: k, label: drawingKindLabels[k] }))}
        value={kind}
        onChange={(v) => setKind(v as DrawingKind)}
        error={fieldError("kind")}
        disabled={busy}
      />
      <TextField
        label="Title"
        optional={isTrade}
        value={title}
        onChange={(e) => setTitle(e.target.value)}
        placeholder={isTrade ? "e.g. Coving profile, left alcove" : undefined}
        hint={
          isTrade
            ? "Left empty, it is named after the kind and the task."
            : "e.g. Elevation, alcoves"
        }
        error={fieldError("title")}
        disabled={busy}
        maxLength={160}
      />
      <TextArea
        label="Note"
        optional
        value={note}
        onChange={(e) => setNote(e.target.value)}
        error={fieldError("note")}
        disabled={busy}
        rows={2}
      />
      {upload.tasks.length === 0 ? (
        <p className="text-sm text-ink-soft">
          There is no task on this job you can add a file to.
        </p>
      ) : (
        <CheckGroup
          legend={isTrade ? "For your task" : "For the tasks"}
          options={upload.tasks.map((t) => ({ value: t.id, label: t.name }))}
          value={taskIds}
          onChange={setTaskIds}
          error={fieldError("taskIds")}
          disabled={busy}
        />
      )}
      {isTrade ? (
        <p className="text-sm text-ink-soft">
          The workshop sees what you add here.
        </p>
      ) : (
        <ShareFields
          options={shareOptions}
          value={share}
          onChange={setShare}
          disabled={busy}
        />
      )}
      {send.progress !== null && (busy || send.isSuccess) ? (
        <ProgressBar
          value={send.progress}
          label={`Uploading ${file?.name ?? "the file"}`}
        />
      ) : null}
      <FormError message={formError} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={busy}>
          {busy ? "Uploading…" : isTrade ? "Add to my task" : "Upload Rev A"}
        </Button>
        <Button
          variant="secondary"
          onClick={() => (busy ? send.cancel() : onCancel())}
        >
          {busy ? "Stop upload" : "Cancel"}
        </Button>
      </div>
    </form>
  );
}
