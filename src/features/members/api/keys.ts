export const memberKeys = {
  all: ["members"] as const,
  list: (workshopId: string) =>
    [...memberKeys.all, "list", workshopId] as const,
  invitations: (workshopId: string) =>
    [...memberKeys.all, "invitations", workshopId] as const,
};
