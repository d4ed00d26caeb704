import { Link } from "react-router-dom";
import { PageHeader } from "../../components/ui";
import {
  DaysOffEditor,
  FeedLink,
} from "../../features/calendar/components/TradeSettings";
import { MyVisits } from "../../features/visits/components/VisitCard";

/**
 * A trade's home (phone first): their visits across every workshop they work for, then their
 * calendar feed and days off — entered once for all of those workshops.
 */
export function TradeHome() {
  return (
    <>
      <PageHeader
        title="Your visits"
        description="Every workshop you work for, soonest first."
      />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="min-w-0">
          <MyVisits />
        </div>
        <div className="flex min-w-0 flex-col gap-6">
          <p className="text-sm">
            <Link
              to="/my-calendar"
              className="text-accent underline underline-offset-2"
            >
              Your visits on a calendar
            </Link>
          </p>
          <FeedLink />
          <DaysOffEditor />
        </div>
      </div>
    </>
  );
}
