// Query keys for drawings; mutations invalidate through these, never a retyped array.
export const drawingKeys = {
  all: ["drawings"] as const,
  /** A job's drawings list. */
  job: (jobId: string) => [...drawingKeys.all, "job", jobId] as const,
  details: () => [...drawingKeys.all, "detail"] as const,
  detail: (drawingId: string) => [...drawingKeys.details(), drawingId] as const,
};
