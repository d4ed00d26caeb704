import { PlanCalendar } from "./PlanCalendar";

/** The workshop's shared calendar: bookings and workshop tasks across its live jobs. */
export function WorkshopCalendar({ workshopId }: { workshopId: string }) {
  return <PlanCalendar scope="workshop" id={workshopId} />;
}
