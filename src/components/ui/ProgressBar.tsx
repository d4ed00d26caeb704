import { cx } from "./cx";

interface ProgressBarProps {
  /** How far along, 0 to 1 (clamped). */
  value: number;
  /** What is progressing, e.g. "Uploading plan.pdf"; names the bar for assistive technology. */
  label: string;
  className?: string;
}

/**
 * A determinate progress bar: role="progressbar" with aria-valuenow 0–100 (WAI-ARIA 1.2,
 * progressbar role), the label visible above it and the percentage beside it, so it reads
 * without the colour.
 */
export function ProgressBar({ value, label, className }: ProgressBarProps) {
  const fraction = Number.isFinite(value) ? Math.min(1, Math.max(0, value)) : 0;
  const percent = Math.round(fraction * 100);
  return (
    <div className={cx("flex flex-col gap-1", className)}>
      <div className="flex items-baseline justify-between gap-2 text-sm">
        <span className="min-w-0 truncate text-ink">{label}</span>
        <span aria-hidden="true" className="font-mono text-ink-soft">
          {percent}%
        </span>
      </div>
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={percent}
        aria-valuetext={`${percent}%`}
        className="h-2.5 w-full overflow-hidden rounded-sm border border-rule-strong bg-paper"
      >
        <div
          className="h-full bg-accent transition-[width] duration-150"
          style={{ width: `${percent}%` }}
        />
      </div>
    </div>
  );
}
