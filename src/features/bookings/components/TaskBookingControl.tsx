import { useState } from "react";
import { Link } from "react-router-dom";
import { BookingStateBadge, Button, Notice } from "../../../components/ui";
import { useJobBookings } from "../api/list-job-bookings";
import { aKind, kindNoun, visitWords } from "../words";
import { BookTradePanel } from "./BookTradePanel";
import { isStanding, type BookableTask } from "./JobBookings";

/**
 * A trade task's booking on the programme: its state and dates, or "Book a …" opening the
 * book panel. The job page has the full history and every action.
 */
export function TaskBookingControl({
  jobId,
  task,
  onChanged,
}: {
  jobId: string;
  task: BookableTask;
  onChanged?: () => void;
}) {
  const bookings = useJobBookings(jobId);
  const [open, setOpen] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);
  if (task.party === "workshop" || !bookings.data) return null;
  // Done work needs no booking: no "Not booked yet — Book …" under a finished task.
  if (task.done && !bookings.data.some((b) => b.taskId === task.id))
    return null;
  const mine = bookings.data.filter((b) => b.taskId === task.id);
  const standing = mine.find(isStanding);
  const declined = !standing
    ? mine.filter((b) => b.state === "declined").at(-1)
    : undefined;
  const kind = kindNoun(task.party);
  const jobLink = (
    <Link
      to={`/jobs/${encodeURIComponent(jobId)}#job-bookings`}
      className="text-accent underline underline-offset-2"
    >
      Booking details
    </Link>
  );

  return (
    <div className="flex flex-col gap-2 text-sm">
      {notice ? <Notice>{notice}</Notice> : null}
      {standing ? (
        <p className="flex flex-wrap items-center gap-x-2 gap-y-1">
          <span className="text-ink-soft">Booking:</span>
          <span className="font-medium">{standing.tradeBusinessName}</span>
          <BookingStateBadge state={standing.state} />
          <span className="font-mono">{visitWords(standing)}</span>
          {jobLink}
        </p>
      ) : (
        <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
          {declined ? (
            <span>
              <span className="font-medium">{declined.tradeBusinessName}</span>{" "}
              <BookingStateBadge state="declined" />
            </span>
          ) : (
            <span className="text-ink-soft">Not booked yet.</span>
          )}
          <Button
            size="sm"
            aria-expanded={open}
            aria-label={`${declined ? `Book another ${kind}` : `Book ${aKind(task.party)}`} for ${task.name}`}
            onClick={() => setOpen(!open)}
          >
            {declined ? `Book another ${kind}` : `Book ${aKind(task.party)}`}
          </Button>
        </div>
      )}
      {open && !standing ? (
        <BookTradePanel
          jobId={jobId}
          taskId={task.id}
          // The programme row shows the task's caution just above the panel.
          caution={null}
          onClose={() => setOpen(false)}
          onBooked={(b) => {
            setOpen(false);
            onChanged?.();
            setNotice(
              b.state === "draft"
                ? `${b.tradeBusinessName} saved as a draft for ${visitWords(b)}.`
                : `Sent to ${b.tradeBusinessName} for ${visitWords(b)}.`,
            );
          }}
        />
      ) : null}
    </div>
  );
}
