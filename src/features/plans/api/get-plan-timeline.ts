import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { fromWire, type WireTimeline } from '@shared/compute/day/wire';
import { api } from '@/lib/api-client';
import type { PlanTimeline } from '../types';
import { planKeys } from './keys';

export async function getPlanTimeline(id: number): Promise<PlanTimeline> {
  return fromWire(await api.get<WireTimeline<PlanTimeline>>(`/plans/${id}/timeline`));
}

export const getPlanTimelineQueryOptions = (id: number) =>
  queryOptions({
    queryKey: planKeys.timeline(id),
    queryFn: () => getPlanTimeline(id),
    // the chart keeps the last day on screen while a saved edit recomputes
    placeholderData: keepPreviousData,
  });

export function usePlanTimeline(id: number) {
  return useQuery(getPlanTimelineQueryOptions(id));
}
