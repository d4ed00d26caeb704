import { useId, type Ref } from "react";
import { cx } from "../../../components/ui";
import { formatBytes } from "../words";

interface FilePickerProps {
  label: string;
  file: File | null;
  onChange: (file: File | null) => void;
  accept: string;
  /** "environment": a phone opens its back camera (HTML Media Capture). */
  capture?: "environment";
  error?: string;
  hint?: string;
  disabled?: boolean;
  ref?: Ref<HTMLInputElement>;
}

/** A native file input (keyboard and screen readers know it), with the chosen file's size. */
export function FilePicker({
  label,
  file,
  onChange,
  accept,
  capture,
  error,
  hint,
  disabled,
  ref,
}: FilePickerProps) {
  const id = useId();
  const describedBy =
    [hint ? `${id}-hint` : null, error ? `${id}-error` : null]
      .filter(Boolean)
      .join(" ") || undefined;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium text-ink">
        {label}
      </label>
      <input
        ref={ref}
        id={id}
        type="file"
        accept={accept}
        capture={capture}
        disabled={disabled}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        onChange={(e) => onChange(e.target.files?.[0] ?? null)}
        className={cx(
          "block w-full rounded border bg-card text-sm text-ink file:mr-3 file:min-h-10 file:cursor-pointer file:rounded-l file:border-0 file:border-r file:border-rule-strong file:bg-paper file:px-4 file:py-2 file:font-medium file:text-ink",
          error ? "border-risk" : "border-rule-strong hover:border-ink-soft",
        )}
      />
      {file ? (
        <p className="text-sm text-ink-soft">
          <span className="text-ink">{file.name}</span>{" "}
          <span className="font-mono">({formatBytes(file.size)})</span>
        </p>
      ) : null}
      {hint ? (
        <p id={`${id}-hint`} className="text-sm text-ink-soft">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="text-sm font-medium text-risk">
          {error}
        </p>
      ) : null}
    </div>
  );
}

interface CheckOption {
  value: string;
  label: string;
  detail?: string;
}

/** A fieldset of checkboxes with a legend, for tasks and sharing. */
export function CheckGroup({
  legend,
  options,
  value,
  onChange,
  error,
  hint,
  disabled,
}: {
  legend: string;
  options: CheckOption[];
  value: string[];
  onChange: (next: string[]) => void;
  error?: string;
  hint?: string;
  disabled?: boolean;
}) {
  const id = useId();
  const describedBy =
    [hint ? `${id}-hint` : null, error ? `${id}-error` : null]
      .filter(Boolean)
      .join(" ") || undefined;
  return (
    <fieldset className="flex flex-col gap-1" aria-describedby={describedBy}>
      <legend className="mb-1 text-sm font-medium text-ink">{legend}</legend>
      {hint ? (
        <p id={`${id}-hint`} className="text-sm text-ink-soft">
          {hint}
        </p>
      ) : null}
      <div className="grid gap-1.5 sm:grid-cols-2">
        {options.map((o) => {
          const checked = value.includes(o.value);
          return (
            <label
              key={o.value}
              className={cx(
                "flex min-h-10 items-center gap-2.5 rounded border px-3 py-1.5 text-sm",
                checked
                  ? "border-accent bg-accent-wash"
                  : "border-rule-strong bg-card",
              )}
            >
              <input
                type="checkbox"
                className="size-4 accent-accent"
                checked={checked}
                disabled={disabled}
                onChange={(e) =>
                  onChange(
                    e.target.checked
                      ? [...value, o.value]
                      : value.filter((v) => v !== o.value),
                  )
                }
              />
              <span className="min-w-0">
                <span className="text-ink">{o.label}</span>
                {o.detail ? (
                  <span className="text-ink-soft"> · {o.detail}</span>
                ) : null}
              </span>
            </label>
          );
        })}
      </div>
      {error ? (
        <p id={`${id}-error`} className="text-sm font-medium text-risk">
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}

/** One choice from a few, as radio buttons (easier on a phone than a select). */
export function RadioGroup({
  legend,
  name,
  options,
  value,
  onChange,
  error,
  disabled,
}: {
  legend: string;
  name: string;
  options: CheckOption[];
  value: string;
  onChange: (next: string) => void;
  error?: string;
  disabled?: boolean;
}) {
  const id = useId();
  return (
    <fieldset
      className="flex flex-col gap-1"
      aria-describedby={error ? `${id}-error` : undefined}
    >
      <legend className="mb-1 text-sm font-medium text-ink">{legend}</legend>
      <div className="flex flex-wrap gap-1.5">
        {options.map((o) => {
          const checked = value === o.value;
          return (
            <label
              key={o.value}
              className={cx(
                "flex min-h-10 items-center gap-2 rounded border px-3 py-1.5 text-sm",
                checked
                  ? "border-accent bg-accent-wash"
                  : "border-rule-strong bg-card",
              )}
            >
              <input
                type="radio"
                name={name}
                value={o.value}
                className="size-4 accent-accent"
                checked={checked}
                disabled={disabled}
                onChange={() => onChange(o.value)}
              />
              {o.label}
            </label>
          );
        })}
      </div>
      {error ? (
        <p id={`${id}-error`} className="text-sm font-medium text-risk">
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}
