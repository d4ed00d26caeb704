import type { HTMLAttributes, ReactNode } from "react";
import { cx } from "./cx";

/** A panel on the paper ground: card colour and a hairline rule, no shadow. */
export function Card({ className, ...rest }: HTMLAttributes<HTMLDivElement>) {
  return (
    <div
      className={cx("rounded border border-rule bg-card", className)}
      {...rest}
    />
  );
}

interface SectionProps {
  title: string;
  /** Heading level: 2 for page sections, 3 inside them. */
  level?: 2 | 3;
  actions?: ReactNode;
  description?: ReactNode;
  children: ReactNode;
  className?: string;
  id?: string;
}

/** A titled card section; its heading labels it for assistive technology. */
export function Section({
  title,
  level = 2,
  actions,
  description,
  children,
  className,
  id,
}: SectionProps) {
  const Heading = level === 2 ? "h2" : "h3";
  const headingId = id ? `${id}-heading` : undefined;
  return (
    <section
      aria-labelledby={headingId}
      id={id}
      className={cx("rounded border border-rule bg-card", className)}
    >
      <div className="flex flex-wrap items-start justify-between gap-2 border-b border-rule px-4 py-3">
        <div>
          <Heading id={headingId} className="text-base font-semibold">
            {title}
          </Heading>
          {description ? (
            <p className="text-sm text-ink-soft">{description}</p>
          ) : null}
        </div>
        {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
      </div>
      <div className="p-4">{children}</div>
    </section>
  );
}
