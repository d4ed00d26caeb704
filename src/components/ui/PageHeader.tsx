import { useEffect, type ReactNode } from "react";

interface PageHeaderProps {
  title: string;
  /** A line above the title, e.g. the workshop's name. */
  eyebrow?: ReactNode;
  description?: ReactNode;
  actions?: ReactNode;
}

/** The page's one h1; it also names the browser tab so history and tabs read well. */
export function PageHeader({
  title,
  eyebrow,
  description,
  actions,
}: PageHeaderProps) {
  useEffect(() => {
    document.title = `${title} · Sitecue`;
  }, [title]);
  return (
    <div className="mb-6 flex flex-wrap items-end justify-between gap-3">
      <div className="min-w-0">
        {eyebrow ? <p className="text-sm text-ink-soft">{eyebrow}</p> : null}
        <h1 className="text-2xl font-semibold tracking-tight break-words">
          {title}
        </h1>
        {description ? (
          <div className="mt-1 max-w-prose text-ink-soft">{description}</div>
        ) : null}
      </div>
      {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
    </div>
  );
}
