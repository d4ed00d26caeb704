import { EmptyState, ErrorState, LoadingState } from "../../../components/ui";
import { useCalendarJobs } from "../api/list-jobs";
import { PlanCalendar } from "./PlanCalendar";

/** The workshop's shared calendar: bookings and workshop tasks across its live jobs. */
export function WorkshopCalendar({ workshopId }: { workshopId: string }) {
  const jobs = useCalendarJobs();
  if (jobs.isPending) return <LoadingState label="Loading the jobs…" />;
  if (jobs.isError)
    return (
      <ErrorState error={jobs.error} onRetry={() => void jobs.refetch()} />
    );
  const mine = jobs.data.filter(
    (j) =>
      j.workshopId === workshopId &&
      (j.viewerRole === "owner" || j.viewerRole === "fitter") &&
      j.status !== "cancelled" &&
      j.status !== "handed-over",
  );
  if (mine.length === 0)
    return (
      <EmptyState title="No live jobs yet">
        Once a job has a programme, its tasks and bookings show here.
      </EmptyState>
    );
  return <PlanCalendar jobs={mine} />;
}
