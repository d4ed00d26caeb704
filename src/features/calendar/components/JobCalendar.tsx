import { Section } from "../../../components/ui";
import { PlanCalendar } from "./PlanCalendar";

/** One job's calendar on the job page (members); loaded lazily with FullCalendar. */
export default function JobCalendar({ jobId }: { jobId: string }) {
  return (
    <Section
      title="Calendar"
      id="job-calendar"
      description="This job's tasks and bookings. Drag one, or use Move, to see the knock-on before saving."
    >
      <PlanCalendar scope="job" id={jobId} showJobFilter={false} />
    </Section>
  );
}
