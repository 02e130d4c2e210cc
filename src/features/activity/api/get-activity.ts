import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ActivityEntry } from '@shared/schemas/activity';
import { api } from '@/lib/api-client';

export const activityKeys = {
  all: ['activity'] as const,
  recent: (limit: number) => [...activityKeys.all, 'recent', limit] as const,
};

export function getActivity(limit = 12): Promise<ActivityEntry[]> {
  return api.get(`/activity?limit=${limit}`);
}

export const getActivityQueryOptions = (limit = 12) =>
  queryOptions({
    queryKey: activityKeys.recent(limit),
    queryFn: () => getActivity(limit),
    staleTime: 15_000,
  });

export function useActivity(limit = 12) {
  return useQuery(getActivityQueryOptions(limit));
}
