// Query keys for the attention list; anything that changes a booking or a programme may refetch through these.
export const attentionKeys = {
  all: ["attention"] as const,
  workshop: (workshopId: string) => [...attentionKeys.all, workshopId] as const,
};
