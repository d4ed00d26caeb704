import type {
  BookingState,
  BookingView,
  HolidayRegion,
  JobStatus,
  Party,
  TaskView,
} from "../../shared/schemas";

// Every word shown for an enum value, in one place, taken from the brief's Words table.

export const partyLabels: Record<Party, string> = {
  workshop: "Workshop",
  plasterer: "Plasterer",
  decorator: "Decorator",
  electrician: "Electrician",
  flooring: "Flooring",
  plumber: "Plumber",
  other: "Other trade",
};

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

export const holidayRegionLabels: Record<HolidayRegion, string> = {
  "GB-ENG": "England",
  "GB-WLS": "Wales",
  "GB-SCT": "Scotland",
  "GB-NIR": "Northern Ireland",
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
