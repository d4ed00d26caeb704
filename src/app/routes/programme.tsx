import { Link, useParams, useSearchParams } from "react-router-dom";
import { cautionFor } from "../../../shared/schemas";
import { useJob } from "../../features/jobs/api/get-job";
import { useRefreshJobBookings } from "../../features/bookings/api/booking-mutation";
import { TaskBookingControl } from "../../features/bookings/components/TaskBookingControl";
import { ProgrammeScreen } from "../../features/programme/components/ProgrammeScreen";
import { ErrorState, LoadingState, PageHeader } from "../../components/ui";
import { isApiError } from "../../lib/api-client";
import { useScrollTarget } from "../../lib/use-scroll-target";

/** The maker's programme for one job (owner and fitter; the API refuses everyone else). */
export function ProgrammeRoute() {
  const { jobId = "" } = useParams();
  const job = useJob(jobId);
  const refreshBookings = useRefreshJobBookings(jobId);
  // `?task=<id>`: a link to one task (e.g. from the attention list) lands on its row, marked.
  const [params] = useSearchParams();
  const selectedTaskId = params.get("task");
  useScrollTarget(selectedTaskId ? `task-row-${selectedTaskId}` : null);
  const back = (
    <p className="mb-3 text-sm">
      <Link
        to={`/jobs/${encodeURIComponent(jobId)}`}
        className="text-accent underline underline-offset-2"
      >
        ← {job.data?.title ?? "Back to the job"}
      </Link>
    </p>
  );
  if (job.isPending)
    return (
      <>
        {back}
        <LoadingState label="Loading the job…" />
      </>
    );
  const isWorkshop =
    job.data?.viewerRole === "owner" || job.data?.viewerRole === "fitter";
  if (job.isError || !isWorkshop) {
    const missing =
      !job.isError ||
      (isApiError(job.error) && [400, 403, 404].includes(job.error.status));
    return (
      <>
        {back}
        <PageHeader title="Programme" />
        <ErrorState
          error={job.error}
          title={missing ? "There's no programme here you can plan" : undefined}
          onRetry={() => job.refetch()}
        />
      </>
    );
  }
  return (
    <>
      {back}
      <PageHeader
        title={`Programme: ${job.data.title}`}
        eyebrow={`${job.data.workshopName} · ${job.data.area}`}
      />
      <ProgrammeScreen
        jobId={jobId}
        selectedTaskId={selectedTaskId}
        onChanged={() => void refreshBookings()}
        renderBooking={(task, refresh) => (
          <TaskBookingControl
            jobId={jobId}
            task={{
              ...task,
              caution: cautionFor(task.party, task.hazards),
              done: !!task.actualFinish,
            }}
            onChanged={refresh}
          />
        )}
      />
    </>
  );
}
