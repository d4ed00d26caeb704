// Query keys for bookings; mutations invalidate through these, never a retyped array.
export const bookingKeys = {
  all: ["bookings"] as const,
  /** Everything about one job's bookings: its list and each task's options. */
  job: (jobId: string) => [...bookingKeys.all, "job", jobId] as const,
  list: (jobId: string) => [...bookingKeys.job(jobId), "list"] as const,
  options: (jobId: string, taskId: string) =>
    [...bookingKeys.job(jobId), "options", taskId] as const,
  link: (bookingId: string) => [...bookingKeys.all, "link", bookingId] as const,
  unansweredAll: () => [...bookingKeys.all, "unanswered"] as const,
  unanswered: (workshopId: string, hours: number) =>
    [...bookingKeys.unansweredAll(), workshopId, hours] as const,
  /** The public confirmation-link page. */
  page: (token: string) => [...bookingKeys.all, "page", token] as const,
};
