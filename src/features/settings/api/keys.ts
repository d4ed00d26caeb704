// Query keys for a workshop's settings; mutations invalidate through these, never a retyped array.
export const settingsKeys = {
  all: ["workshop-settings"] as const,
  detail: (workshopId: string) =>
    [...settingsKeys.all, "detail", workshopId] as const,
};
