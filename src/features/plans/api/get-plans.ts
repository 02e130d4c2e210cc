import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { PlanListItem } from '../types';
import { planKeys, type PlanListFilters } from './keys';

export function getPlans(filters: PlanListFilters = {}): Promise<PlanListItem[]> {
  const query = new URLSearchParams();
  if (filters.status) query.set('status', filters.status);
  if (filters.stationId) query.set('stationId', String(filters.stationId));
  const suffix = query.size ? `?${query}` : '';
  return api.get(`/plans${suffix}`);
}

export const getPlansQueryOptions = (filters: PlanListFilters = {}) =>
  queryOptions({ queryKey: planKeys.list(filters), queryFn: () => getPlans(filters) });

export function usePlans(filters: PlanListFilters = {}) {
  return useQuery(getPlansQueryOptions(filters));
}
