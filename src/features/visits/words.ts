// A visit in the trade's plain words (brief, "Words": booking states, clear to start, waiting on;
// "Look and feel": dates with the weekday, the 24-hour clock).
import type { Visit } from "../../../shared/schemas";
import { clearFromWhenDone } from "../../../shared/programme";
import { formatDateShort } from "../../lib/format";

/** "Thu 5 Mar" for a local date or date-time (the year only outside this one). */
export const dayWords = (instant: string) =>
  formatDateShort(instant.slice(0, 10));

/** The visit's days: "Thu 5 Mar", or "Thu 5 Mar – Fri 6 Mar". */
export function daysWords(v: Pick<Visit, "start" | "finish">): string {
  const a = v.start.slice(0, 10);
  const b = v.finish.slice(0, 10);
  return a === b ? dayWords(a) : `${dayWords(a)} – ${dayWords(b)}`;
}

/** The booking state as the trade reads it (the Words table's state, then what it asks of them), and its tone. */
export function stateWords(v: Visit): {
  text: string;
  tone: "ok" | "wait" | "risk" | "accent" | "muted";
} {
  switch (v.state) {
    case "confirmed":
      return { text: "Confirmed", tone: "ok" };
    case "sent":
      return { text: "Sent: please confirm", tone: "accent" };
    case "needs-reconfirming":
      return { text: "Needs re-confirming: the dates moved", tone: "accent" };
    case "date-proposed":
      return {
        text: `Date proposed: ${v.proposedStart ? dayWords(v.proposedStart) : "another start"}, waiting for ${v.workshopName}`,
        tone: "wait",
      };
    case "declined":
      return { text: "Declined", tone: "muted" };
    case "cancelled":
      return { text: `Cancelled by ${v.workshopName}`, tone: "muted" };
    case "draft":
      return { text: "Draft: not sent yet", tone: "muted" };
  }
}

/** "Clear to start", "Waiting on Fix carcasses & scribes (planned Thu 5 Mar)", "Started", "Done". */
export function readinessWords(v: Visit): {
  text: string;
  tone: "ok" | "wait" | "accent";
} {
  const r = v.readiness;
  switch (r.state) {
    case "done":
      return { text: "Done", tone: "ok" };
    case "started":
      return { text: "Started", tone: "accent" };
    case "clear":
      return { text: "Clear to start", tone: "ok" };
    case "waiting": {
      // Everything it waits for is done; only time is left (the rest of that day, a drying lag).
      const from = clearFromWhenDone(r.waitingOn);
      if (from)
        return { text: `Clear to start from ${dayWords(from)}`, tone: "ok" };
      return {
        text: `Waiting on ${r.waitingOn
          .map(
            (w) =>
              `${w.name}${w.plannedFinish ? ` (planned ${dayWords(w.plannedFinish)})` : ""}`,
          )
          .join(", ")}`,
        tone: "wait",
      };
    }
  }
}

/** Today's date in the browser, YYYY-MM-DD. */
export function todayLocal(): string {
  const d = new Date();
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, "0")}-${String(d.getDate()).padStart(2, "0")}`;
}
