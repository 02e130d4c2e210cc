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

/** How often the day is re-projected while the clock holds a step at now (a task overrunning, a start late). */
export const REPROJECT_MS = 15_000;

/**
 * When to re-project as time passes with nothing logged: every `REPROJECT_MS` while the clock holds
 * a step at now, else once the clock reaches the moment it would (`steadyUntil`), else never. A log
 * arrives through the live stream instead.
 */
export function reprojectIn(view: RunScreenData | undefined, nowMs = Date.now()): number | false {
  if (!view) return false;
  if (view.clock.held) return REPROJECT_MS;
  if (view.clock.steadyUntil === null) return false;
  const due = Date.parse(view.run.startedAt) + view.clock.steadyUntil * 1000 - nowMs;
  // a run opened ahead of its start waits at most an hour between checks (timers hold 24 days at most)
  return Math.min(3_600_000, Math.max(1000, Math.ceil(due) + 500));
}

export const getRunQueryOptions = (id: number) =>
  queryOptions({
    queryKey: runKeys.detail(id),
    queryFn: () => getRun(id),
    // the screen keeps the last projection on the wall while the next one is computed
    placeholderData: keepPreviousData,
    refetchInterval: (query) => reprojectIn(query.state.data),
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
