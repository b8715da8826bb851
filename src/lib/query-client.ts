import { QueryClient } from "@tanstack/react-query";
import { ApiError } from "@/lib/api-client";

/** Up to two retries for network trouble and 5xx; none for 4xx, which a retry cannot fix. */
function shouldRetry(failureCount: number, error: unknown): boolean {
  if (error instanceof ApiError && error.isClientError) return false;
  return failureCount < 2;
}

/** The app's QueryClient with Lotwise's defaults. */
export function createQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        retry: shouldRetry,
        staleTime: 30_000,
        refetchOnWindowFocus: true,
      },
      mutations: {
        retry: false,
      },
    },
  });
}
