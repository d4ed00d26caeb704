import { Link } from "react-router-dom";
import type { JobSummary } from "../../../shared/schemas";
import { FeedLink } from "../../features/calendar/components/TradeSettings";
import { JobDrawings } from "../../features/drawings/components/JobDrawings";
import { JobThread } from "../../features/thread/components/JobThread";
import { AwayDatesEditor } from "../../features/timeline/components/AwayDatesEditor";
import { VisitTimeline } from "../../features/timeline/components/VisitTimeline";

// A customer uploads nothing and shares nothing: the drawings list only shows what is shared.
const noSharing = { tradeKinds: [], trades: [], customerName: null };

/**
 * What a customer sees of one job, on her home and on the job's page alike (brief, scenario 3):
 * who comes when and what to prepare, what changed since her last look and the handover (the
 * timeline), the dates she will be away, the drawings shared with her and the thread. Never the
 * float, a booking's internal state or a trade's contact details. One column, phone first.
 */
export function CustomerJobView({
  jobId,
  oneOfSeveral = false,
}: {
  jobId: string;
  /** On her home, beside her other jobs: each section gets an id of its own (no repeated ids). */
  oneOfSeveral?: boolean;
}) {
  return (
    <div className="flex max-w-3xl min-w-0 flex-col gap-6">
      <VisitTimeline jobId={jobId} />
      <AwayDatesEditor jobId={jobId} />
      <JobDrawings
        jobId={jobId}
        shareOptions={noSharing}
        sectionId={oneOfSeveral ? `drawings-${jobId}` : undefined}
      />
      <JobThread
        jobId={jobId}
        sectionId={oneOfSeveral ? `thread-${jobId}` : undefined}
      />
    </div>
  );
}

/** One of the customer's jobs on her home: its title (a link to its page), then its view. */
function CustomerJob({ job }: { job: JobSummary }) {
  // The title names the job when the customer has more than one, and leads to its page (the
  // address and access notes).
  return (
    <section
      aria-labelledby={`job-${job.id}-title`}
      className="flex flex-col gap-6"
    >
      <h2 id={`job-${job.id}-title`} className="text-lg font-semibold">
        <Link
          to={`/jobs/${job.id}`}
          className="underline-offset-2 hover:underline"
        >
          {job.title}
        </Link>{" "}
        <span className="text-sm font-normal text-ink-soft">
          · {job.workshopName}
        </span>
      </h2>
      <CustomerJobView jobId={job.id} oneOfSeveral />
    </section>
  );
}

/** Each of the customer's jobs, one after another. */
export function CustomerJobs({ jobs }: { jobs: JobSummary[] }) {
  return (
    <div className="flex flex-col gap-10">
      {jobs.map((job) => (
        <CustomerJob key={job.id} job={job} />
      ))}
    </div>
  );
}

/**
 * The customer's home: for each of her jobs, its view (above); her calendar feed once, for all
 * of them.
 */
export function CustomerHome({ jobs }: { jobs: JobSummary[] }) {
  return (
    <div className="flex flex-col gap-10">
      <CustomerJobs jobs={jobs} />
      <div className="max-w-3xl">
        <FeedLink />
      </div>
    </div>
  );
}
