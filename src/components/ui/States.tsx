import type { ReactNode } from "react";
import { errorMessage, isApiError } from "../../lib/api-client";
import { Button } from "./Button";
import { cx } from "./cx";

export function Spinner({ className }: { className?: string }) {
  return (
    <span
      aria-hidden="true"
      className={cx(
        "inline-block size-4 animate-spin rounded-full border-2 border-accent border-r-transparent",
        className,
      )}
    />
  );
}

/** A polite live region so screen readers hear that something is loading. */
export function LoadingState({ label = "Loading…" }: { label?: string }) {
  return (
    <div
      role="status"
      className="flex items-center gap-2 py-6 text-sm text-ink-soft"
    >
      <Spinner />
      <span>{label}</span>
    </div>
  );
}

interface EmptyStateProps {
  title: string;
  children?: ReactNode;
  action?: ReactNode;
}

export function EmptyState({ title, children, action }: EmptyStateProps) {
  return (
    <div className="rounded border border-dashed border-rule-strong px-4 py-8 text-center">
      <p className="font-medium">{title}</p>
      {children ? (
        <div className="mx-auto mt-1 max-w-prose text-sm text-ink-soft">
          {children}
        </div>
      ) : null}
      {action ? <div className="mt-4 flex justify-center">{action}</div> : null}
    </div>
  );
}

interface ErrorStateProps {
  error: unknown;
  title?: string;
  onRetry?: () => void;
}

/** Shows what went wrong in words, and a retry when trying again could help. */
export function ErrorState({ error, title, onRetry }: ErrorStateProps) {
  const heading =
    title ??
    (isApiError(error) && error.status === 403
      ? "You don't have access to this"
      : isApiError(error) && error.status === 404
        ? "Not found"
        : "This could not be loaded");
  const retryable =
    !isApiError(error) ||
    error.status === 0 ||
    error.status >= 500 ||
    error.status === 429;
  return (
    <div
      role="alert"
      className="rounded border border-risk/40 bg-risk-wash px-4 py-4"
    >
      <p className="font-semibold">{heading}</p>
      <p className="mt-1 text-sm">{errorMessage(error)}</p>
      {onRetry && retryable ? (
        <Button
          variant="secondary"
          size="sm"
          className="mt-3"
          onClick={onRetry}
        >
          Try again
        </Button>
      ) : null}
    </div>
  );
}

/** A form-level error (not tied to one field), announced when it appears. */
export function FormError({
  message,
  className,
}: {
  message?: string | null;
  className?: string;
}) {
  if (!message) return null;
  return (
    <p
      role="alert"
      className={cx(
        "rounded border border-risk/40 bg-risk-wash px-3 py-2 text-sm font-medium",
        className,
      )}
    >
      {message}
    </p>
  );
}

/** A success note after an action, announced politely. */
export function Notice({ children }: { children: ReactNode }) {
  return (
    <p
      role="status"
      className="rounded border border-ok/40 bg-ok-wash px-3 py-2 text-sm"
    >
      {children}
    </p>
  );
}

/** The safety note a task brief carries (electrical work, height, tall units). */
export function CautionNote({ children }: { children: ReactNode }) {
  return (
    <div className="rounded border border-wait/50 border-l-4 border-l-wait bg-wait-wash px-3 py-2 text-sm">
      <span className="font-semibold text-wait-ink">Caution: </span>
      <span>{children}</span>
    </div>
  );
}
