import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PlanComparison } from '@shared/compute/plan-compare';
import { api } from '@/lib/api-client';
import { planKeys } from './keys';

export function comparePlan(id: number, from: number, to: number): Promise<PlanComparison> {
  return api.get(`/plans/${id}/compare?from=${from}&to=${to}`);
}

export const comparePlanQueryOptions = (id: number, from: number, to: number) =>
  queryOptions({ queryKey: planKeys.compare(id, from, to), queryFn: () => comparePlan(id, from, to) });

export const useComparePlan = (id: number, from: number | null | undefined, to: number) =>
  useQuery({
    ...comparePlanQueryOptions(id, from ?? 0, to),
    enabled: from != null && from > 0 && from !== to,
  });
