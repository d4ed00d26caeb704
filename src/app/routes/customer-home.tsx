import { Link } from "react-router-dom";
import type { JobSummary } from "../../../shared/schemas";
import { FeedLink } from "../../features/calendar/components/TradeSettings";
import { JobDrawings } from "../../features/drawings/components/JobDrawings";
import { JobThread } from "../../features/thread/components/JobThread";
import { AwayDatesEditor } from "../../features/timeline/components/AwayDatesEditor";
import { VisitTimeline } from "../../features/timeline/components/VisitTimeline";

// A customer uploads nothing and shares nothing: the drawings list only shows what is shared.
const noSharing = { tradeKinds: [], trades: [], customerName: null };

/** One of the customer's jobs: its visits, away dates, drawings shared with them and the thread. */
function CustomerJob({ job }: { job: JobSummary }) {
  // The job's title links to its page (its details and parties), and names the job when the
  // customer has more than one.
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
      {/* One column, phone first: what comes next, then the days away, then the rest. */}
      <div className="flex max-w-3xl flex-col gap-6">
        <VisitTimeline jobId={job.id} />
        <AwayDatesEditor jobId={job.id} />
        <JobDrawings jobId={job.id} shareOptions={noSharing} />
        <JobThread jobId={job.id} />
      </div>
    </section>
  );
}

/**
 * The customer's home (brief, scenario 3): for each of their jobs, who arrives when and what to
 * prepare, the dates they will be away, the drawings shared with them and the whole-job thread;
 * their calendar feed once, for all of them.
 */
export function CustomerHome({ jobs }: { jobs: JobSummary[] }) {
  return (
    <div className="flex flex-col gap-10">
      {jobs.map((job) => (
        <CustomerJob key={job.id} job={job} />
      ))}
      <div className="max-w-3xl">
        <FeedLink />
      </div>
    </div>
  );
}
