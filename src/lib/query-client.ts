import { QueryClient, type DefaultOptions } from '@tanstack/react-query';
import { isApiError } from './api-client';

const MAX_RETRIES = 2;

export const queryConfig = {
  queries: {
    staleTime: 30_000,
    refetchOnWindowFocus: false,
    // a 4xx will not change on retry; network faults and 5xx might
    retry: (failureCount, error) => {
      if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
      return failureCount < MAX_RETRIES;
    },
  },
} satisfies DefaultOptions;

export function createQueryClient() {
  return new QueryClient({ defaultOptions: queryConfig });
}
