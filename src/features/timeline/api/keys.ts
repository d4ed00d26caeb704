// Query keys for the customer's timeline; mutations update through these, never a retyped array.
export const timelineKeys = {
  all: ["timeline"] as const,
  job: (jobId: string) => [...timelineKeys.all, jobId] as const,
};
