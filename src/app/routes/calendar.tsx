// Loaded lazily (router `lazy`), so FullCalendar stays out of the main bundle.
import { PageHeader } from "../../components/ui";
import { FeedLink } from "../../features/calendar/components/TradeSettings";
import { WorkshopCalendar } from "../../features/calendar/components/WorkshopCalendar";
import { useActiveWorkshop } from "../active-workshop";
import { MembersOnly } from "./members-only";

/** /calendar: the workshop's shared calendar (owner and fitters). */
export function Component() {
  const { active } = useActiveWorkshop();
  if (!active) return <MembersOnly title="Calendar" />;
  return (
    <>
      <PageHeader title="Calendar" eyebrow={active.workshopName} />
      <div className="flex flex-col gap-6">
        <WorkshopCalendar workshopId={active.workshopId} />
        {/* Owners and fitters get the workshop's feed too (issue 16): every booking and the
            workshop's own tasks, in their own calendar app. */}
        <div className="max-w-xl">
          <FeedLink description="Subscribe to the workshop's bookings and its own tasks in your calendar app. Keep the link private." />
        </div>
      </div>
    </>
  );
}
