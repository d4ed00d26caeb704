import { partyColours } from "./party-colours";
import type { ReactNode } from "react";
import type {
  BookingState,
  JobStatus,
  Party,
  TaskView,
} from "../../../shared/schemas";
import {
  bookingStateLabels,
  jobStatusLabels,
  partyLabels,
  taskStatusLabels,
} from "../../lib/labels";
import { cx } from "./cx";

// Colour is decoration here: the swatch or dot carries the token, the text is always
// ink so every badge keeps its contrast and reads without colour.

/** A trade kind (or the workshop) as a chip: colour swatch plus its name. */
export function PartyChip({
  party,
  children,
}: {
  party: Party;
  children?: ReactNode;
}) {
  return (
    <span className="inline-flex max-w-full items-center gap-1.5 rounded border border-rule bg-paper px-2 py-0.5 text-xs font-medium text-ink">
      <span
        aria-hidden="true"
        className={cx("size-2.5 shrink-0 rounded-sm", partyColours[party].fill)}
      />
      <span className="truncate">{children ?? partyLabels[party]}</span>
    </span>
  );
}

type Tone = "neutral" | "accent" | "ok" | "wait" | "risk" | "muted";

const toneDot: Record<Tone, string> = {
  neutral: "bg-ink-soft",
  accent: "bg-accent",
  ok: "bg-ok",
  wait: "bg-wait",
  risk: "bg-risk",
  muted: "bg-rule-strong",
};
const toneFrame: Record<Tone, string> = {
  neutral: "border-rule bg-card",
  accent: "border-accent/30 bg-accent-wash",
  ok: "border-ok/30 bg-ok-wash",
  wait: "border-wait/40 bg-wait-wash",
  risk: "border-risk/30 bg-risk-wash",
  muted: "border-rule bg-paper text-ink-soft",
};

export function StatusBadge({
  tone,
  children,
}: {
  tone: Tone;
  children: ReactNode;
}) {
  return (
    <span
      className={cx(
        "inline-flex items-center gap-1.5 whitespace-nowrap rounded border px-2 py-0.5 text-xs font-medium text-ink",
        toneFrame[tone],
      )}
    >
      <span
        aria-hidden="true"
        className={cx("size-2 rounded-full", toneDot[tone])}
      />
      {children}
    </span>
  );
}

const jobTone: Record<JobStatus, Tone> = {
  survey: "neutral",
  planned: "accent",
  "on-site": "wait",
  "handed-over": "ok",
  cancelled: "muted",
};

export function JobStatusBadge({ status }: { status: JobStatus }) {
  return (
    <StatusBadge tone={jobTone[status]}>{jobStatusLabels[status]}</StatusBadge>
  );
}

const bookingTone: Record<BookingState, Tone> = {
  draft: "neutral",
  sent: "accent",
  confirmed: "ok",
  declined: "risk",
  "date-proposed": "wait",
  "needs-reconfirming": "wait",
  cancelled: "muted",
};

/**
 * For the customer a booking is a visit: either it is confirmed or it is not yet, so the
 * workshop's intermediate states (sent, date proposed…) read as "To be confirmed".
 */
export function BookingStateBadge({
  state,
  asVisit = false,
}: {
  state: BookingState;
  asVisit?: boolean;
}) {
  if (
    asVisit &&
    state !== "confirmed" &&
    state !== "cancelled" &&
    state !== "declined"
  ) {
    return <StatusBadge tone="wait">To be confirmed</StatusBadge>;
  }
  return (
    <StatusBadge tone={bookingTone[state]}>
      {bookingStateLabels[state]}
    </StatusBadge>
  );
}

const taskTone: Record<TaskView["status"], Tone> = {
  "not-started": "neutral",
  started: "accent",
  done: "ok",
};

export function TaskStatusBadge({ status }: { status: TaskView["status"] }) {
  return (
    <StatusBadge tone={taskTone[status]}>
      {taskStatusLabels[status]}
    </StatusBadge>
  );
}
