import type { ButtonHTMLAttributes, Ref } from "react";
import { Link, type LinkProps } from "react-router-dom";
import { cx } from "./cx";

type Variant = "primary" | "secondary" | "danger" | "quiet" | "quiet-danger";
type Size = "md" | "sm";

const base =
  "inline-flex items-center justify-center gap-2 rounded border font-medium transition-colors disabled:opacity-60 disabled:cursor-not-allowed";
const variants: Record<Variant, string> = {
  primary:
    "border-accent bg-accent text-card hover:bg-accent-strong hover:border-accent-strong",
  secondary: "border-rule-strong bg-card text-ink hover:border-ink-soft",
  danger: "border-risk bg-risk text-card hover:brightness-95",
  quiet:
    "border-transparent bg-transparent text-accent hover:underline underline-offset-2",
  "quiet-danger":
    "border-transparent bg-transparent text-risk hover:underline underline-offset-2",
};
// Quiet buttons read as links, so they sit flush with the text around them.
const isQuiet = (v: Variant) => v === "quiet" || v === "quiet-danger";
const sizes: Record<Size, string> = {
  md: "min-h-10 py-2 text-sm",
  sm: "min-h-8 py-1 text-sm",
};
const padding: Record<Size, string> = { md: "px-4", sm: "px-3" };

export function buttonClasses(
  variant: Variant = "primary",
  size: Size = "md",
  className?: string,
): string {
  return cx(
    base,
    variants[variant],
    sizes[size],
    !isQuiet(variant) && padding[size],
    className,
  );
}

interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: Variant;
  size?: Size;
  /** Shows the action in progress and blocks a second press. */
  busy?: boolean;
  ref?: Ref<HTMLButtonElement>;
}

export function Button({
  variant,
  size,
  busy,
  className,
  disabled,
  children,
  type,
  ...rest
}: ButtonProps) {
  return (
    <button
      type={type ?? "button"}
      className={buttonClasses(variant, size, className)}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      {...rest}
    >
      {busy ? (
        <span
          aria-hidden="true"
          className="size-3.5 animate-spin rounded-full border-2 border-current border-r-transparent"
        />
      ) : null}
      {children}
    </button>
  );
}

interface LinkButtonProps extends LinkProps {
  variant?: Variant;
  size?: Size;
}

/** A router link that looks like a button (navigation, not an action). */
export function LinkButton({
  variant,
  size,
  className,
  ...rest
}: LinkButtonProps) {
  return (
    <Link
      className={buttonClasses(variant, size, className as string | undefined)}
      {...rest}
    />
  );
}
