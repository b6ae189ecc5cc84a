import { QueryClient, type DefaultOptions } from '@tanstack/react-query';
import { isApiError } from './api-client';

/**
 * Retry only what may succeed on a second try: network loss and server faults. A 4xx answer
 * (refused, not found, not signed in) will not change by asking again.
 */
function shouldRetry(failureCount: number, error: unknown): boolean {
  if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
  return failureCount < 2;
}

export const queryConfig = {
  queries: {
    retry: shouldRetry,
    // Station data changes through live events; a refetch on every window focus only adds load.
    refetchOnWindowFocus: false,
    staleTime: 30_000,
  },
  mutations: {
    retry: false,
  },
} satisfies DefaultOptions;

export function createQueryClient(): QueryClient {
  return new QueryClient({ defaultOptions: queryConfig });
}

export const queryClient = createQueryClient();
