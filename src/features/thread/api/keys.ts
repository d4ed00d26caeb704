// Query keys for the thread; mutations and polls write through these, never a retyped array.
export const threadKeys = {
  all: ["thread"] as const,
  /** One job's thread: the merged list of every message loaded so far. */
  job: (jobId: string) => [...threadKeys.all, "job", jobId] as const,
};
