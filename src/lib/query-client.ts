import { MutationCache, QueryCache, QueryClient } from "@tanstack/react-query";
import { isApiError } from "./api-client";

interface QueryClientHooks {
  /** Called when any request answers 401: the session has ended under us. */
  onUnauthenticated?: () => void;
}

/** The app's query client: no retries for answers the server meant (4xx). */
export function createQueryClient(hooks: QueryClientHooks = {}): QueryClient {
  const handle = (error: unknown) => {
    if (
      isApiError(error) &&
      error.status === 401 &&
      error.code === "unauthenticated"
    ) {
      hooks.onUnauthenticated?.();
    }
  };
  return new QueryClient({
    queryCache: new QueryCache({ onError: handle }),
    mutationCache: new MutationCache({ onError: handle }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        refetchOnWindowFocus: true,
        retry: (failureCount, error) => {
          if (isApiError(error) && error.status >= 400 && error.status < 500)
            return false;
          return failureCount < 2;
        },
      },
      mutations: { retry: false },
    },
  });
}
