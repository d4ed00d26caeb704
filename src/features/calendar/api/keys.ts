// Query keys for the calendars; mutations write and invalidate through these.
export const calendarKeys = {
  all: ["calendar"] as const,
  jobs: () => [...calendarKeys.all, "jobs"] as const,
  programme: (jobId: string) =>
    [...calendarKeys.all, "programme", jobId] as const,
  jobDetail: (jobId: string) => [...calendarKeys.all, "job", jobId] as const,
  daysOff: () => [...calendarKeys.all, "days-off"] as const,
  feed: () => [...calendarKeys.all, "feed"] as const,
  tradeBusy: (tradeId: string, from: string, to: string) =>
    [...calendarKeys.all, "trade-busy", tradeId, from, to] as const,
};
