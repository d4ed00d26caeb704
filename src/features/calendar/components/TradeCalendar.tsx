import { useMemo } from "react";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui";
import { useCalendarRange } from "../api/get-calendar";
import { asEntries } from "../model";
import { CalendarView, useDayRange } from "./CalendarView";

/** A trade's own visits from every workshop they work for, in one view (read-only). */
export function TradeCalendar() {
  const [range, setRange] = useDayRange();
  const calendar = useCalendarRange({ scope: "me", ...range });
  const data = calendar.data;
  const entries = useMemo(() => asEntries(data?.entries ?? []), [data]);

  if (calendar.isPending) return <LoadingState label="Loading your visits…" />;
  if (!data)
    return (
      <ErrorState
        error={calendar.error}
        onRetry={() => void calendar.refetch()}
      />
    );
  // No booking on any day (not only the ones in view): nothing to show yet.
  if (data.jobs.length === 0)
    return (
      <EmptyState title="No visits booked yet">
        When a workshop books you for a job, the visit shows here.
      </EmptyState>
    );
  const workshops = [...new Set(data.jobs.map((j) => j.workshopName))];
  return (
    <div className="flex flex-col gap-3">
      <p className="text-sm text-ink-soft">
        Your visits for {workshops.join(" and ")}. Each workshop sees your other
        bookings only as “busy”.
      </p>
      <CalendarView
        entries={entries}
        marks={data.marks}
        range={range}
        onRangeChange={setRange}
        loading={calendar.isPlaceholderData}
        emptyText="No visits in these days."
      />
    </div>
  );
}
