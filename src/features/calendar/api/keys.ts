import type { CalendarScope } from "../../../../shared/schemas";

// Query keys for the calendars; mutations write and invalidate through these.
export const calendarKeys = {
  all: ["calendar"] as const,
  ranges: () => [...calendarKeys.all, "range"] as const,
  range: (scope: CalendarScope, id: string, from: string, to: string) =>
    [...calendarKeys.ranges(), scope, id, from, to] as const,
  programmes: () => [...calendarKeys.all, "programme"] as const,
  programme: (jobId: string) => [...calendarKeys.programmes(), jobId] as const,
  daysOff: () => [...calendarKeys.all, "days-off"] as const,
  feed: () => [...calendarKeys.all, "feed"] as const,
  tradeBusy: (tradeId: string, from: string, to: string) =>
    [...calendarKeys.all, "trade-busy", tradeId, from, to] as const,
};
