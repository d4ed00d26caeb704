import {
  useId,
  type InputHTMLAttributes,
  type ReactNode,
  type Ref,
  type SelectHTMLAttributes,
  type TextareaHTMLAttributes,
} from "react";
import { cx } from "./cx";

const control =
  "block w-full rounded border bg-card px-3 py-2 text-base text-ink placeholder:text-ink-soft/70 sm:text-sm";
const controlState = (invalid: boolean) =>
  invalid ? "border-risk" : "border-rule-strong hover:border-ink-soft";

interface FieldShellProps {
  id: string;
  label: string;
  error?: string;
  hint?: ReactNode;
  optional?: boolean;
  className?: string;
  children: ReactNode;
}

/** Label above, control, then the hint and the error, both linked by aria-describedby. */
function FieldShell({
  id,
  label,
  error,
  hint,
  optional,
  className,
  children,
}: FieldShellProps) {
  return (
    <div className={cx("flex flex-col gap-1", className)}>
      <label htmlFor={id} className="text-sm font-medium text-ink">
        {label}
        {optional ? (
          <span className="font-normal text-ink-soft"> (optional)</span>
        ) : null}
      </label>
      {children}
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

function describedBy(
  id: string,
  error?: string,
  hint?: ReactNode,
): string | undefined {
  const ids = [hint ? `${id}-hint` : null, error ? `${id}-error` : null].filter(
    Boolean,
  );
  return ids.length ? ids.join(" ") : undefined;
}

interface TextFieldProps extends Omit<
  InputHTMLAttributes<HTMLInputElement>,
  "className"
> {
  label: string;
  error?: string;
  hint?: ReactNode;
  optional?: boolean;
  className?: string;
  inputClassName?: string;
  ref?: Ref<HTMLInputElement>;
}

export function TextField({
  label,
  error,
  hint,
  optional,
  className,
  inputClassName,
  id,
  ...rest
}: TextFieldProps) {
  const autoId = useId();
  const fieldId = id ?? autoId;
  return (
    <FieldShell
      id={fieldId}
      label={label}
      error={error}
      hint={hint}
      optional={optional}
      className={className}
    >
      <input
        id={fieldId}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(fieldId, error, hint)}
        className={cx(control, controlState(!!error), inputClassName)}
        {...rest}
      />
    </FieldShell>
  );
}

interface TextAreaProps extends Omit<
  TextareaHTMLAttributes<HTMLTextAreaElement>,
  "className"
> {
  label: string;
  error?: string;
  hint?: ReactNode;
  optional?: boolean;
  className?: string;
  ref?: Ref<HTMLTextAreaElement>;
}

export function TextArea({
  label,
  error,
  hint,
  optional,
  className,
  id,
  rows,
  ...rest
}: TextAreaProps) {
  const autoId = useId();
  const fieldId = id ?? autoId;
  return (
    <FieldShell
      id={fieldId}
      label={label}
      error={error}
      hint={hint}
      optional={optional}
      className={className}
    >
      <textarea
        id={fieldId}
        rows={rows ?? 3}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(fieldId, error, hint)}
        className={cx(control, controlState(!!error))}
        {...rest}
      />
    </FieldShell>
  );
}

interface SelectProps extends Omit<
  SelectHTMLAttributes<HTMLSelectElement>,
  "className"
> {
  label: string;
  error?: string;
  hint?: ReactNode;
  optional?: boolean;
  className?: string;
  ref?: Ref<HTMLSelectElement>;
}

export function Select({
  label,
  error,
  hint,
  optional,
  className,
  id,
  children,
  ...rest
}: SelectProps) {
  const autoId = useId();
  const fieldId = id ?? autoId;
  return (
    <FieldShell
      id={fieldId}
      label={label}
      error={error}
      hint={hint}
      optional={optional}
      className={className}
    >
      <select
        id={fieldId}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(fieldId, error, hint)}
        className={cx(control, controlState(!!error), "pr-8")}
        {...rest}
      >
        {children}
      </select>
    </FieldShell>
  );
}

interface WeekdayPickerProps {
  legend: string;
  value: number[];
  onChange: (days: number[]) => void;
  error?: string;
}

const WEEKDAYS = [
  [1, "Mon"],
  [2, "Tue"],
  [3, "Wed"],
  [4, "Thu"],
  [5, "Fri"],
  [6, "Sat"],
  [7, "Sun"],
] as const;

/** ISO weekdays (1 = Monday) as a row of checkboxes. */
export function WeekdayPicker({
  legend,
  value,
  onChange,
  error,
}: WeekdayPickerProps) {
  const errorId = useId();
  return (
    <fieldset
      className="flex flex-col gap-1"
      aria-describedby={error ? errorId : undefined}
    >
      <legend className="mb-1 text-sm font-medium text-ink">{legend}</legend>
      <div className="flex flex-wrap gap-1.5">
        {WEEKDAYS.map(([n, name]) => {
          const checked = value.includes(n);
          return (
            <label
              key={n}
              className={cx(
                "flex min-h-9 items-center gap-1.5 rounded border px-2.5 text-sm",
                checked
                  ? "border-accent bg-accent-wash"
                  : "border-rule-strong bg-card",
              )}
            >
              <input
                type="checkbox"
                className="accent-accent"
                checked={checked}
                onChange={(e) =>
                  onChange(
                    e.target.checked
                      ? [...value, n].sort((a, b) => a - b)
                      : value.filter((d) => d !== n),
                  )
                }
              />
              {name}
            </label>
          );
        })}
      </div>
      {error ? (
        <p id={errorId} className="text-sm font-medium text-risk">
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}
