import { lazy, Suspense, useState } from "react";
import { useQueryClient } from "@tanstack/react-query";
import {
  Link,
  useLocation,
  useNavigate,
  useParams,
  useSearchParams,
} from "react-router-dom";
import { useJob } from "../../features/jobs/api/get-job";
import { jobKeys } from "../../features/jobs/api/keys";
import { JobBookings } from "../../features/bookings/components/JobBookings";
import { JobDrawings } from "../../features/drawings/components/JobDrawings";
import { DeleteJobButton } from "../../features/jobs/components/DeleteJobButton";
import { EditJobForm } from "../../features/jobs/components/EditJobForm";
import { JobThread } from "../../features/thread/components/JobThread";
import {
  JobBookingsSection,
  JobDetailsSection,
  JobPartiesSection,
  JobTasksSection,
} from "../../features/jobs/components/JobDetailView";
import {
  Button,
  ErrorState,
  JobStatusBadge,
  LoadingState,
  PageHeader,
  Section,
} from "../../components/ui";
import { isApiError } from "../../lib/api-client";
import { useScrollTarget } from "../../lib/use-scroll-target";
import { homeTitle } from "../../features/auth/viewer";
import { useViewer } from "../layout/guards";
import { CustomerJobView } from "./customer-home";
import { shareOptionsOf } from "./drawing";

// FullCalendar loads only when a member opens a job, not with the main bundle.
const JobCalendar = lazy(
  () => import("../../features/calendar/components/JobCalendar"),
);

/** Back to the home page, by its heading ("Your visits" for a trade or a customer). */
function BackLink() {
  const viewer = useViewer();
  return (
    <p className="mb-3 text-sm">
      <Link to="/" className="text-accent underline underline-offset-2">
        ← {viewer.isMember ? "All jobs" : homeTitle(viewer)}
      </Link>
    </p>
  );
}

export function JobRoute() {
  const { jobId = "" } = useParams();
  const navigate = useNavigate();
  const job = useJob(jobId);
  const queryClient = useQueryClient();
  const [editing, setEditing] = useState(false);
  // Links to one booking, one task to book or one section (e.g. from the attention list).
  const [params] = useSearchParams();
  const { hash } = useLocation();
  const bookingTarget = params.get("booking");
  const bookTarget = params.get("book");
  useScrollTarget(
    job.isSuccess
      ? bookingTarget
        ? `booking-${bookingTarget}`
        : bookTarget
          ? `book-${bookTarget}`
          : hash
            ? decodeURIComponent(hash.slice(1))
            : null
      : null,
  );

  if (job.isPending) {
    return (
      <>
        <BackLink />
        <LoadingState label="Loading the job…" />
      </>
    );
  }
  if (job.isError) {
    // 403 and 404 read the same to the person: this job isn't theirs to see.
    const missing =
      isApiError(job.error) &&
      (job.error.status === 404 ||
        job.error.status === 403 ||
        job.error.status === 400);
    return (
      <>
        <BackLink />
        <PageHeader title={missing ? "Job not found" : "Job"} />
        <ErrorState
          error={job.error}
          title={missing ? "There's no job here you can see" : undefined}
          onRetry={() => job.refetch()}
        />
      </>
    );
  }

  const j = job.data;
  const isWorkshop = j.viewerRole === "owner" || j.viewerRole === "fitter";
  const eyebrow = (
    <span className="flex flex-wrap items-center gap-2">
      <span>{j.workshopName}</span>
      <span aria-hidden="true">·</span>
      <span>{j.area}</span>
      <JobStatusBadge status={j.status} />
    </span>
  );
  if (j.viewerRole === "customer") {
    // The customer's page for her job is the same plain view as her home (who comes when, what
    // to prepare, what changed since she last looked), beside her address and access notes. Not
    // the programme's tasks, the bookings' states or the list of parties.
    return (
      <>
        <BackLink />
        <PageHeader title={j.title} eyebrow={eyebrow} />
        <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
          <CustomerJobView jobId={j.id} />
          <div className="flex min-w-0 flex-col gap-6">
            <JobDetailsSection job={j} />
          </div>
        </div>
      </>
    );
  }
  return (
    <>
      <BackLink />
      <PageHeader
        title={j.title}
        eyebrow={eyebrow}
        actions={
          isWorkshop && !editing ? (
            <Button variant="secondary" onClick={() => setEditing(true)}>
              Edit job
            </Button>
          ) : null
        }
      />
      {editing ? (
        <Section title="Edit job" className="mb-6">
          <EditJobForm
            job={j}
            onSaved={() => setEditing(false)}
            onCancel={() => setEditing(false)}
          />
        </Section>
      ) : null}
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="flex min-w-0 flex-col gap-6">
          <JobTasksSection job={j} />
          {isWorkshop ? (
            // The workshop books and answers here; a trade sees the bookings read-only.
            <JobBookings
              jobId={j.id}
              workshopId={j.workshopId}
              tasks={j.tasks.map((t) => ({
                id: t.id,
                name: t.name,
                party: t.party,
                caution: t.detail?.caution ?? null,
                done: t.status === "done",
              }))}
              onChanged={() =>
                void queryClient.invalidateQueries({
                  queryKey: jobKeys.detail(j.id),
                })
              }
            />
          ) : (
            <JobBookingsSection job={j} />
          )}
          <JobDrawings jobId={j.id} shareOptions={shareOptionsOf(j)} />
          {/* Every role who sees the job has its thread (their audiences only). */}
          <JobThread jobId={j.id} />
        </div>
        <div className="flex min-w-0 flex-col gap-6">
          <JobDetailsSection job={j} />
          <JobPartiesSection job={j} />
          {j.viewerRole === "owner" ? (
            <DeleteJobButton
              jobId={j.id}
              title={j.title}
              onDeleted={() => navigate("/", { replace: true })}
            />
          ) : null}
        </div>
      </div>
      {isWorkshop ? (
        <div className="mt-6">
          <Suspense fallback={<LoadingState label="Loading the calendar…" />}>
            <JobCalendar jobId={j.id} />
          </Suspense>
        </div>
      ) : null}
    </>
  );
}
