export const tradeKeys = {
  all: ["trades"] as const,
  lists: () => [...tradeKeys.all, "list"] as const,
  list: (workshopId: string) => [...tradeKeys.lists(), workshopId] as const,
};
