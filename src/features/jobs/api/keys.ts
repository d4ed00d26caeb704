// Query keys for jobs; mutations invalidate through these, never a retyped array.
export const jobKeys = {
  all: ["jobs"] as const,
  lists: () => [...jobKeys.all, "list"] as const,
  details: () => [...jobKeys.all, "detail"] as const,
  detail: (jobId: string) => [...jobKeys.details(), jobId] as const,
  starters: (workshopId: string) =>
    [...jobKeys.all, "starters", workshopId] as const,
};
