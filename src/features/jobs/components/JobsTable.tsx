import { Link } from "react-router-dom";
import type { JobSummary } from "../../../../shared/schemas";
import { JobStatusBadge, cx } from "../../../components/ui";
import { formatDate } from "../../../lib/format";

export type JobsTableVariant = "workshop" | "party";

interface JobsTableProps {
  jobs: JobSummary[];
  /** "workshop": the maker's dense list; "party": trades and customers, fewer columns. */
  variant: JobsTableVariant;
  caption: string;
}

interface Column {
  key: string;
  label: string;
  className?: string;
  render: (job: JobSummary) => React.ReactNode;
}

const titleColumn: Column = {
  key: "title",
  label: "Job",
  render: (job) => (
    <Link
      to={`/jobs/${job.id}`}
      className="font-semibold text-accent underline-offset-2 hover:underline"
    >
      {job.title}
    </Link>
  ),
};
const customerColumn: Column = {
  key: "customer",
  label: "Customer",
  render: (job) => job.customerName ?? <span className="text-ink-soft">—</span>,
};
const workshopColumn: Column = {
  key: "workshop",
  label: "Workshop",
  render: (job) => job.workshopName,
};
const areaColumn: Column = {
  key: "area",
  label: "Area",
  render: (job) => job.area,
};
const statusColumn: Column = {
  key: "status",
  label: "Status",
  render: (job) => <JobStatusBadge status={job.status} />,
};
const handoverColumn: Column = {
  key: "handover",
  label: "Agreed handover",
  className: "whitespace-nowrap",
  render: (job) =>
    job.handoverDate ? (
      <span className="font-mono text-sm">{formatDate(job.handoverDate)}</span>
    ) : (
      <span className="text-ink-soft">Not set</span>
    ),
};
const nextEventColumn: Column = {
  key: "next",
  label: "Next",
  render: (job) =>
    job.nextEvent ? (
      <span>
        <span className="font-mono text-sm whitespace-nowrap">
          {formatDate(job.nextEvent.date, false)}
        </span>{" "}
        <span className="text-ink-soft">{job.nextEvent.label}</span>
      </span>
    ) : (
      <span className="text-ink-soft">Nothing planned</span>
    ),
};

const columnsFor: Record<JobsTableVariant, Column[]> = {
  workshop: [
    titleColumn,
    customerColumn,
    areaColumn,
    statusColumn,
    handoverColumn,
    nextEventColumn,
  ],
  party: [
    titleColumn,
    workshopColumn,
    areaColumn,
    statusColumn,
    nextEventColumn,
    handoverColumn,
  ],
};

/**
 * One table for every width: at phone width each row becomes a small card and each
 * cell shows its own label, so there is a single copy of the data in the page.
 */
export function JobsTable({ jobs, variant, caption }: JobsTableProps) {
  const columns = columnsFor[variant];
  return (
    <div className="overflow-hidden rounded border border-rule bg-card">
      <table className="w-full border-collapse text-left text-sm max-md:block">
        <caption className="sr-only">{caption}</caption>
        <thead className="border-b border-rule bg-paper max-md:sr-only">
          <tr>
            {columns.map((c) => (
              <th
                key={c.key}
                scope="col"
                className="px-3 py-2 text-xs font-semibold tracking-wide text-ink-soft uppercase"
              >
                {c.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody className="max-md:block">
          {jobs.map((job) => (
            <tr
              key={job.id}
              className="border-b border-rule last:border-b-0 max-md:block max-md:px-3 max-md:py-3"
            >
              {columns.map((c, i) => (
                <td
                  key={c.key}
                  className={cx(
                    "px-3 py-2.5 align-top max-md:flex max-md:gap-2 max-md:px-0 max-md:py-0.5",
                    i === 0 && "max-md:pb-1.5 max-md:text-base",
                    c.className,
                  )}
                >
                  {i > 0 ? (
                    <span className="w-20 shrink-0 text-ink-soft md:hidden">
                      {c.label}
                    </span>
                  ) : null}
                  <span className="min-w-0">{c.render(job)}</span>
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
