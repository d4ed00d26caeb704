export const customerKeys = {
  all: ["customers"] as const,
  lists: () => [...customerKeys.all, "list"] as const,
  list: (workshopId: string) => [...customerKeys.lists(), workshopId] as const,
};
