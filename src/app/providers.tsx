import { QueryClientProvider } from "@tanstack/react-query";
import { useState } from "react";
import { RouterProvider } from "react-router-dom";
import { createQueryClient } from "../lib/query-client";
import { authKeys } from "../features/auth/api/keys";
import { createAppRouter } from "./router";

export function AppProviders() {
  const [queryClient] = useState(() => {
    const client = createQueryClient({
      // A 401 anywhere means the session ended (expired, signed out in another tab):
      // reload the session so the route guard sends the person to sign in.
      onUnauthenticated: () =>
        void client.invalidateQueries({ queryKey: authKeys.session() }),
    });
    return client;
  });
  const [router] = useState(() => createAppRouter());
  return (
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>
  );
}
