import { queryOptions, useQuery } from "@tanstack/react-query";
import type {
  CalendarResponse,
  CalendarScope,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import type { DayRange } from "../model";
import { calendarKeys } from "./keys";

export interface CalendarRequest extends DayRange {
  scope: CalendarScope;
  /** The workshop's or the job's id; none for a trade's own calendar. */
  id?: string;
}

/** GET /api/calendar: entries and day marks of the range, built on the server. */
export function getCalendar(
  q: CalendarRequest,
  signal?: AbortSignal,
): Promise<CalendarResponse> {
  const params = new URLSearchParams({ scope: q.scope });
  if (q.id) params.set("id", q.id);
  params.set("from", q.from);
  params.set("to", q.to);
  return api.get<CalendarResponse>(`/api/calendar?${params}`, signal);
}

export const calendarRangeQueryOptions = (q: CalendarRequest) =>
  queryOptions({
    queryKey: calendarKeys.range(q.scope, q.id ?? "", q.from, q.to),
    queryFn: ({ signal }) => getCalendar(q, signal),
  });

/**
 * The calendar of the days in view, one request per range. While the next range loads, the
 * last one of the same calendar stays on screen (`isPlaceholderData`), so the view never flashes.
 */
export function useCalendarRange(q: CalendarRequest) {
  return useQuery({
    ...calendarRangeQueryOptions(q),
    placeholderData: (previous, previousQuery) =>
      previousQuery?.queryKey[2] === q.scope &&
      previousQuery.queryKey[3] === (q.id ?? "")
        ? previous
        : undefined,
  });
}
