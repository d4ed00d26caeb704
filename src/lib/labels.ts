import { partyWords } from "../../shared/words/trades";
import {
  nationLabels,
  type ArrivalWindow,
  type BookingState,
  type BookingView,
  type HolidayRegion,
  type JobStatus,
  type Party,
  type TaskView,
} from "../../shared/schemas";

// Every word shown for an enum value, in one place, taken from the brief's Words table.

/** A party as a choice or a label ("Flooring fitter", "Other trade"): the shared trade words. */
export const partyLabels = Object.fromEntries(
  Object.entries(partyWords).map(([p, w]) => [p, w.choice]),
) as Record<Party, string>;

export const jobStatusLabels: Record<JobStatus, string> = {
  survey: "Survey",
  planned: "Planned",
  "on-site": "On site",
  "handed-over": "Handed over",
  cancelled: "Cancelled",
};

export const bookingStateLabels: Record<BookingState, string> = {
  draft: "Draft",
  sent: "Sent",
  confirmed: "Confirmed",
  declined: "Declined",
  "date-proposed": "Date proposed",
  "needs-reconfirming": "Needs re-confirming",
  cancelled: "Cancelled",
};

export const taskStatusLabels: Record<TaskView["status"], string> = {
  "not-started": "Not started",
  started: "Started",
  done: "Done",
};

export const roleLabels = {
  owner: "Owner",
  fitter: "Fitter",
  trade: "Trade",
  customer: "Customer",
} as const;

/** A nation in words: the one map lives in shared (England and Wales are one choice). */
export const holidayRegionLabels: Record<HolidayRegion, string> = nationLabels;

/** An arrival time as a choice: the booking form and the workshop's settings offer these words. */
export const arrivalChoiceLabels: Record<ArrivalWindow, string> = {
  morning: "Morning",
  afternoon: "Afternoon",
  "all-day": "All day",
  range: "Between set times",
};

export const linkKindLabels = {
  FS: "finish-to-start",
  SS: "start-to-start",
  FF: "finish-to-finish",
} as const;

/** "Morning", "All day", "08:00–10:00". */
export function arrivalWindowLabel(
  b: Pick<BookingView, "arrivalWindow" | "arrivalFrom" | "arrivalTo">,
): string {
  switch (b.arrivalWindow) {
    case "morning":
      return "Morning";
    case "afternoon":
      return "Afternoon";
    case "all-day":
      return "All day";
    case "range":
      return b.arrivalFrom && b.arrivalTo
        ? `${b.arrivalFrom}–${b.arrivalTo}`
        : "Time to be agreed";
  }
}
