import { zodResolver } from "@hookform/resolvers/zod";
import { useId, useRef, useState, type KeyboardEvent } from "react";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import {
  ALLOWED_UPLOAD_LABELS,
  ALLOWED_UPLOAD_TYPES,
  postMessageFieldsSchema,
  THREAD_MAX_FILES,
  threadAudienceLabels,
  type ThreadAudience,
} from "../../../../shared/schemas";
import { Button, FormError, Select, TextArea } from "../../../components/ui";
import { ProgressBar } from "../../../components/ui/ProgressBar";
import { applyServerErrors } from "../../../lib/form-errors";
import { useSendMessage } from "../api/post-message";
import { formatFileSize } from "../format-size";
import { audienceReaders } from "./AudienceChip";

type Input = z.input<typeof postMessageFieldsSchema>;
type Output = z.output<typeof postMessageFieldsSchema>;

const allowedExtensions = new Set<string>([
  ...ALLOWED_UPLOAD_TYPES.map((t) => t.extension),
  "jpeg",
]);
const allowedTypes = new Set<string>(
  ALLOWED_UPLOAD_TYPES.map((t) => t.mimeType),
);

/** The browser's claim is only a first check (the server sniffs the content and decides). */
function refusedFile(f: File): string | null {
  const ext = f.name.includes(".")
    ? f.name.slice(f.name.lastIndexOf(".") + 1).toLowerCase()
    : "";
  if (allowedExtensions.has(ext) || allowedTypes.has(f.type)) return null;
  return `“${f.name}” can't be attached: Sitecue takes ${ALLOWED_UPLOAD_LABELS} files.`;
}

const isMac =
  typeof navigator !== "undefined" &&
  /Mac|iPhone|iPad/.test(navigator.userAgent);

interface ThreadComposerProps {
  jobId: string;
  /** What the server lets this person post to, widest first. */
  audiences: ThreadAudience[];
  /** Preselected when allowed (else the widest). */
  defaultAudience?: ThreadAudience;
}

/**
 * Writes a message to one audience, with up to THREAD_MAX_FILES files. On any refusal the text,
 * the audience and the chosen files stay as they were, with the server's reason beside them.
 */
export function ThreadComposer({
  jobId,
  audiences,
  defaultAudience,
}: ThreadComposerProps) {
  const send = useSendMessage(jobId);
  const [files, setFiles] = useState<File[]>([]);
  const [fileError, setFileError] = useState<string | null>(null);
  const [progress, setProgress] = useState<number | null>(null);
  const fileInput = useRef<HTMLInputElement>(null);
  const formRef = useRef<HTMLFormElement>(null);
  const readersId = useId();

  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(postMessageFieldsSchema),
    defaultValues: {
      audience:
        defaultAudience && audiences.includes(defaultAudience)
          ? defaultAudience
          : audiences[0],
      text: "",
    },
  });
  const { errors } = form.formState;
  const audience = useWatch({ control: form.control, name: "audience" });

  const [formError, setFormError] = useState<string | null>(null);

  const onSubmit = form.handleSubmit((fields) => {
    if (!fields.text && files.length === 0) {
      form.setError("text", {
        type: "required",
        message: "Write a message or attach a file",
      });
      return;
    }
    setFormError(null);
    setProgress(files.length > 0 ? 0 : null);
    send.mutate(
      {
        audience: fields.audience,
        text: fields.text,
        files,
        onProgress: setProgress,
      },
      {
        onSuccess: () => {
          form.reset({ audience: fields.audience, text: "" });
          setFiles([]);
          setFileError(null);
        },
        // The server's per-field reasons go on the fields, the rest beside the Send button.
        onError: (error) =>
          setFormError(
            applyServerErrors(error, form.setError, ["text", "audience"]),
          ),
        onSettled: () => setProgress(null),
      },
    );
  });

  const addFiles = (picked: FileList | null) => {
    if (!picked) return;
    const chosen = [...files, ...Array.from(picked)];
    const refused = chosen.map(refusedFile).find(Boolean) ?? null;
    if (refused) {
      setFileError(refused);
      return;
    }
    if (chosen.length > THREAD_MAX_FILES) {
      setFileError(`Attach at most ${THREAD_MAX_FILES} files to one message.`);
      return;
    }
    setFileError(null);
    setFiles(chosen);
  };

  const onKeyDown = (e: KeyboardEvent<HTMLTextAreaElement>) => {
    if (e.key === "Enter" && (e.ctrlKey || e.metaKey)) {
      e.preventDefault();
      formRef.current?.requestSubmit();
    }
  };

  const textField = form.register("text");
  const single = audiences.length === 1;
  const busy = send.isPending;

  return (
    <form
      ref={formRef}
      onSubmit={onSubmit}
      noValidate
      aria-label="New message"
      className="flex flex-col gap-3"
    >
      {single ? (
        <p className="text-sm" id={readersId}>
          <span className="font-medium">
            To: {threadAudienceLabels[audiences[0]]}.
          </span>{" "}
          <span className="text-ink-soft">{audienceReaders[audiences[0]]}</span>
        </p>
      ) : (
        <Select
          label="Who sees it"
          hint={audience ? audienceReaders[audience] : undefined}
          error={errors.audience?.message}
          {...form.register("audience")}
        >
          {audiences.map((a) => (
            <option key={a} value={a}>
              {threadAudienceLabels[a]}
            </option>
          ))}
        </Select>
      )}
      <TextArea
        label="Message"
        rows={3}
        hint={`${isMac ? "⌘" : "Ctrl"}+Enter sends.`}
        error={errors.text?.message}
        onKeyDown={onKeyDown}
        {...textField}
      />
      <input
        ref={fileInput}
        type="file"
        multiple
        hidden
        accept={[
          ...ALLOWED_UPLOAD_TYPES.map((t) => t.mimeType),
          ...[...allowedExtensions].map((e) => `.${e}`),
        ].join(",")}
        onChange={(e) => {
          addFiles(e.target.files);
          // The same file can be picked again after removing it.
          e.target.value = "";
        }}
        data-testid="thread-file-input"
      />
      {files.length > 0 ? (
        <ul aria-label="Files to send" className="flex flex-col gap-1.5">
          {files.map((f, i) => (
            <li
              key={`${f.name}-${i}`}
              className="flex items-center justify-between gap-2 rounded border border-rule bg-paper px-3 py-1.5 text-sm"
            >
              <span className="min-w-0 truncate">
                {f.name}{" "}
                <span className="text-ink-soft">{formatFileSize(f.size)}</span>
              </span>
              <Button
                variant="quiet-danger"
                size="sm"
                disabled={busy}
                onClick={() => setFiles(files.filter((_, j) => j !== i))}
                aria-label={`Remove ${f.name}`}
              >
                Remove
              </Button>
            </li>
          ))}
        </ul>
      ) : null}
      {progress !== null ? (
        <ProgressBar
          value={progress}
          label={
            files.length === 1
              ? `Uploading ${files[0].name}`
              : `Uploading ${files.length} files`
          }
        />
      ) : null}
      <FormError message={fileError ?? formError} />
      <div className="flex flex-wrap items-center justify-between gap-2">
        <Button
          variant="secondary"
          onClick={() => fileInput.current?.click()}
          disabled={busy || files.length >= THREAD_MAX_FILES}
        >
          Attach files
        </Button>
        <Button type="submit" busy={busy}>
          Send
        </Button>
      </div>
    </form>
  );
}
