import { useMemo } from "react";
import type { JobDetail } from "../../../../shared/schemas";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui";
import { useJobDetails } from "../api/get-job-details";
import { useCalendarJobs } from "../api/list-jobs";
import { useMyDaysOff } from "../api/my-days-off";
import {
  addDays,
  entriesOfJobBookings,
  holidayMarks,
  todayDate,
  type DayMark,
} from "../model";
import { CalendarView } from "./CalendarView";

/** A trade's own visits from every workshop they work for, in one view (read-only). */
export function TradeCalendar() {
  const jobs = useCalendarJobs();
  const tradeJobs = (jobs.data ?? []).filter((j) => j.viewerRole === "trade");
  const details = useJobDetails(tradeJobs.map((j) => j.id));
  const dataKey = details.map((q) => q.dataUpdatedAt).join(",");
  const entries = useMemo(
    () =>
      details
        .map((q) => q.data)
        .filter((d): d is JobDetail => !!d)
        .flatMap(entriesOfJobBookings),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [dataKey],
  );
  const daysOff = useMyDaysOff();
  const marks = useMemo<DayMark[]>(() => {
    const today = todayDate();
    const regions = details
      .map((q) => q.data?.holidayRegion)
      .filter((r): r is NonNullable<typeof r> => !!r);
    return [
      ...holidayMarks(regions, addDays(today, -60), addDays(today, 400)),
      ...(daysOff.data?.daysOff ?? []).map((date): DayMark => ({
        date,
        kind: "day-off",
        label: "Your day off",
      })),
    ];
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [daysOff.data, dataKey]);

  if (jobs.isPending || details.some((q) => q.isPending))
    return <LoadingState label="Loading your visits…" />;
  const failed = jobs.isError ? jobs : details.find((q) => q.isError);
  if (failed)
    return (
      <ErrorState error={failed.error} onRetry={() => void failed.refetch()} />
    );
  if (entries.length === 0)
    return (
      <EmptyState title="No visits booked yet">
        When a workshop books you for a job, the visit shows here.
      </EmptyState>
    );
  const workshops = [...new Set(tradeJobs.map((j) => j.workshopName))];
  return (
    <div className="flex flex-col gap-3">
      <p className="text-sm text-ink-soft">
        Your visits for {workshops.join(" and ")}. Each workshop sees your other
        bookings only as “busy”.
      </p>
      <CalendarView
        entries={entries}
        marks={marks}
        emptyText="No visits in these days."
      />
    </div>
  );
}
