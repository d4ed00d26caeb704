// Loaded lazily (router `lazy`), so FullCalendar stays out of the main bundle.
import { PageHeader } from "../../components/ui";
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
      <WorkshopCalendar workshopId={active.workshopId} />
    </>
  );
}
