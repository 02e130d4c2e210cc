import { queryOptions, useQuery } from '@tanstack/react-query';
import type { WalkthroughSummary } from '@shared/schemas/walkthrough';
import { api } from '@/lib/api-client';
import { walkthroughKeys, type WalkthroughListFilters } from './keys';

export function getWalkthroughs(filters: WalkthroughListFilters = {}): Promise<WalkthroughSummary[]> {
  const query = new URLSearchParams();
  if (filters.planId) query.set('planId', String(filters.planId));
  if (filters.stationId) query.set('stationId', String(filters.stationId));
  return api.get(`/walkthroughs${query.size ? `?${query}` : ''}`);
}

export const getWalkthroughsQueryOptions = (filters: WalkthroughListFilters = {}) =>
  queryOptions({ queryKey: walkthroughKeys.list(filters), queryFn: () => getWalkthroughs(filters) });

export function useWalkthroughs(filters: WalkthroughListFilters = {}) {
  return useQuery(getWalkthroughsQueryOptions(filters));
}
