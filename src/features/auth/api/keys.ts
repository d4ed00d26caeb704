// Query keys for the auth feature; every query and invalidation goes through these.
export const authKeys = {
  all: ["auth"] as const,
  session: () => [...authKeys.all, "session"] as const,
  token: (token: string) => [...authKeys.all, "token", token] as const,
};
