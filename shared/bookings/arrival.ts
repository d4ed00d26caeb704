// The arrival a booking states must follow its booked slot (issue 16): a booking moved from a
// Friday afternoon to a Tuesday morning used to keep "afternoon" in its e-mail while its calendar
// part said 08:00. One rule for every move (re-booked after a slip, a proposal accepted).
import type { ArrivalWindow } from "../schemas/common";

/** Where the day's morning slot ends and the afternoon's begins (the engine's half-day). */
export const MIDDAY = "12:00";

export interface Arrival {
  arrivalWindow: ArrivalWindow;
  arrivalFrom: string | null;
  arrivalTo: string | null;
}

/**
 * The arrival for a booking whose slot is now `start`–`finish` (local "YYYY-MM-DDTHH:mm"), given
 * what it said before: a slot from midday is an afternoon arrival; a slot from the morning keeps
 * a morning, all-day or morning arrival time it had, and an afternoon one becomes the morning.
 */
export function arrivalForSlot(start: string, was: Arrival): Arrival {
  const time = start.length > 10 ? start.slice(11, 16) : "00:00";
  if (time >= MIDDAY)
    return { arrivalWindow: "afternoon", arrivalFrom: null, arrivalTo: null };
  const morningRange =
    was.arrivalWindow === "range" &&
    was.arrivalFrom !== null &&
    was.arrivalFrom >= time &&
    was.arrivalFrom < MIDDAY;
  if (
    was.arrivalWindow === "morning" ||
    was.arrivalWindow === "all-day" ||
    morningRange
  )
    return {
      arrivalWindow: was.arrivalWindow,
      arrivalFrom: was.arrivalFrom,
      arrivalTo: was.arrivalTo,
    };
  return { arrivalWindow: "morning", arrivalFrom: null, arrivalTo: null };
}
