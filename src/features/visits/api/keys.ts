// Query keys for a trade's visits; mutations invalidate through these, never a retyped array.
export const visitKeys = {
  all: ["visits"] as const,
  mine: () => [...visitKeys.all, "mine"] as const,
  detail: (bookingId: string) =>
    [...visitKeys.all, "detail", bookingId] as const,
};
