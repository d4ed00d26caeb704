// Loaded lazily (router `lazy`), so FullCalendar stays out of the main bundle.
import { PageHeader } from "../../components/ui";
import { TradeCalendar } from "../../features/calendar/components/TradeCalendar";
import {
  DaysOffEditor,
  FeedLink,
} from "../../features/calendar/components/TradeSettings";

/** /my-calendar: a trade's visits across every workshop they work for, days off, feed. */
export function Component() {
  return (
    <>
      <PageHeader title="My calendar" />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="min-w-0">
          <TradeCalendar />
        </div>
        <div className="flex min-w-0 flex-col gap-6">
          <DaysOffEditor />
          <FeedLink />
        </div>
      </div>
    </>
  );
}
