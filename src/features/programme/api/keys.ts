// Query keys for programmes; mutations write and invalidate through these, never a retyped array.
export const programmeKeys = {
  all: ["programme"] as const,
  details: () => [...programmeKeys.all, "detail"] as const,
  detail: (jobId: string) => [...programmeKeys.details(), jobId] as const,
};
