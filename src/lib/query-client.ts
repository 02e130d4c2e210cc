import {
  QueryClient,
  type DefaultOptions,
  type InvalidateOptions,
  type InvalidateQueryFilters,
  type QueryKey,
} from '@tanstack/react-query';
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

/**
 * An invalidation is never answered by a fetch sent before it: every fetch in flight under the
 * filters is sent again, and whoever waits on it (a screen, a route loader) gets the new answer.
 * TanStack Query restarts a fetch in flight itself only for a query that already holds data and is
 * refetched; a first load (a screen opened a moment before a save or a change on the live stream),
 * or a fetch no screen shows, would otherwise stand for the change with an answer read before it,
 * and that answer clears the invalidation, so nothing would ask again.
 */
class ChangeSafeQueryClient extends QueryClient {
  override invalidateQueries<TTaggedQueryKey extends QueryKey = QueryKey>(
    filters?: InvalidateQueryFilters<TTaggedQueryKey>,
    options: InvalidateOptions = {},
  ): Promise<void> {
    if (filters?.refetchType !== 'none')
      for (const query of this.getQueryCache().findAll({ ...filters, fetchStatus: 'fetching' })) {
        void query.cancel({ silent: true });
        query.fetch().catch(() => {
          // the query's state holds the error for whoever shows it
        });
      }
    // what is in flight now was sent after the change: the refetch joins it
    return super.invalidateQueries(filters, { ...options, cancelRefetch: false });
  }
}

export function createQueryClient(): QueryClient {
  return new ChangeSafeQueryClient({ defaultOptions: queryConfig });
}
