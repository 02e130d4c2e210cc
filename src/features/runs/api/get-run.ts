import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Timeline } from '@shared/compute/day/types';
import { fromWire } from '@shared/compute/day/wire';
import type { RunSummary, RunView } from '@shared/schemas/run';
import { api } from '@/lib/api-client';
import { runKeys } from './keys';

/** A run as the screen shows it: the planned and re-projected days decoded. */
export interface RunScreenData extends Omit<RunView, 'planned' | 'projected'> {
  planned: Timeline;
  projected: Timeline;
}

export async function getRun(id: number): Promise<RunScreenData> {
  const view = await api.get<RunView>(`/runs/${id}`);
  return {
    ...view,
    planned: fromWire(view.planned) as Timeline,
    projected: fromWire(view.projected) as Timeline,
  };
}

export const getRunQueryOptions = (id: number) =>
  queryOptions({
    queryKey: runKeys.detail(id),
    queryFn: () => getRun(id),
    // the screen keeps the last projection on the wall while the next one is computed
    placeholderData: keepPreviousData,
  });

export function useRun(id: number) {
  return useQuery(getRunQueryOptions(id));
}

export const getPlanRuns = (planId: number): Promise<RunSummary[]> => api.get(`/plans/${planId}/runs`);

export const getPlanRunsQueryOptions = (planId: number) =>
  queryOptions({ queryKey: runKeys.ofPlan(planId), queryFn: () => getPlanRuns(planId) });

export function usePlanRuns(planId: number) {
  return useQuery(getPlanRunsQueryOptions(planId));
}
