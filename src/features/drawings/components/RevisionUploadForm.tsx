import { useEffect, useRef, useState, type FormEvent } from "react";
import {
  addRevisionFieldsSchema,
  UPLOAD_ACCEPT,
  type DrawingDetail,
} from "../../../../shared/schemas";
import {
  Button,
  FormError,
  ProgressBar,
  TextArea,
} from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { addRevisionUpload } from "../api/add-revision";
import { useDrawingUpload } from "../api/drawing-upload";
import { checkUploadFile, megabytes, UPLOAD_MAX_BYTES } from "../words";
import { FilePicker } from "./FilePicker";
import {
  serverFieldErrors,
  zodFieldErrors,
  type FieldErrors,
} from "./form-errors";

/** The next revision of a drawing: a new file and what changed. Earlier revisions stay. */
export function RevisionUploadForm({
  drawing,
  nextLetter,
  onUploaded,
  onCancel,
}: {
  drawing: DrawingDetail;
  nextLetter: string;
  onUploaded: (d: DrawingDetail) => void;
  onCancel: () => void;
}) {
  const [file, setFile] = useState<File | null>(null);
  const [note, setNote] = useState("");
  const [errors, setErrors] = useState<FieldErrors>({});
  const send = useDrawingUpload(drawing.jobId);
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

  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    if (busy) return;
    const found: FieldErrors = {};
    if (!file) found.file = "Choose the file of the new revision.";
    else {
      const refused = checkUploadFile(file);
      if (refused) found.file = refused;
    }
    const parsed = addRevisionFieldsSchema.safeParse({ note });
    if (!parsed.success) Object.assign(found, zodFieldErrors(parsed.error));
    setErrors(found);
    if (Object.keys(found).length > 0 || !file || !parsed.success) return;
    send.mutate(addRevisionUpload(drawing.id, file, parsed.data.note), {
      onSuccess: onUploaded,
    });
  };

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={`Upload Rev ${nextLetter}`}
      className="flex flex-col gap-4"
    >
      <FilePicker
        ref={fileInput}
        label={`File for Rev ${nextLetter}`}
        file={file}
        onChange={(f) => {
          setFile(f);
          setErrors((x) => ({
            ...x,
            file: f ? (checkUploadFile(f) ?? undefined) : undefined,
          }));
          if (send.isError) send.reset();
        }}
        accept={UPLOAD_ACCEPT}
        hint={`PDF, PNG, JPEG, WebP or DXF; up to ${megabytes(UPLOAD_MAX_BYTES)}. Rev ${drawing.currentRevision} stays in the list.`}
        error={fieldError("file")}
        disabled={busy}
      />
      <TextArea
        label="What changed"
        value={note}
        onChange={(e) => setNote(e.target.value)}
        placeholder="e.g. Left alcove 12 mm narrower at the top; scribe widened"
        error={fieldError("note")}
        disabled={busy}
        rows={2}
      />
      {send.progress !== null && (busy || send.isSuccess) ? (
        <ProgressBar
          value={send.progress}
          label={`Uploading ${file?.name ?? "the file"}`}
        />
      ) : null}
      <FormError message={formError} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={busy}>
          {busy ? "Uploading…" : `Upload Rev ${nextLetter}`}
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
