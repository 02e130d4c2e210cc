import type { PlanStatus } from '@shared/schemas/plan';

export interface PlanListFilters {
  status?: PlanStatus;
  stationId?: number;
}

export const planKeys = {
  all: ['plans'] as const,
  lists: () => [...planKeys.all, 'list'] as const,
  list: (filters: PlanListFilters = {}) => [...planKeys.lists(), filters] as const,
  details: () => [...planKeys.all, 'detail'] as const,
  detail: (id: number) => [...planKeys.details(), id] as const,
  timeline: (id: number) => [...planKeys.detail(id), 'timeline'] as const,
  compare: (id: number, from: number, to: number) => [...planKeys.detail(id), 'compare', from, to] as const,
  allFlownEstimates: () => [...planKeys.all, 'flown-estimates'] as const,
  flownEstimates: (stationId: number) => [...planKeys.allFlownEstimates(), stationId] as const,
};
