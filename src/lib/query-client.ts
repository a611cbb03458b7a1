import { QueryClient } from '@tanstack/react-query';
import { ApiError } from '@/lib/api-client';

const MAX_RETRIES = 2;

/**
 * Retry only what may succeed on a second try: lost connections and server trouble.
 * A 4xx answer will be the same next time (and a 429 asks us to wait, not to hammer).
 */
export function shouldRetry(failureCount: number, error: unknown): boolean {
  if (error instanceof ApiError && error.status >= 400 && error.status < 500) return false;
  return failureCount < MAX_RETRIES;
}

export const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      retry: shouldRetry,
      // The socket announces changes, so data stays fresh without refetching on every mount.
      staleTime: 30_000,
      refetchOnWindowFocus: true,
    },
    mutations: {
      // A repeated POST could file a report twice; the user decides to try again.
      retry: false,
    },
  },
});
