export const mailKeys = {
  all: ["dev-mail"] as const,
  list: () => [...mailKeys.all, "list"] as const,
};
