import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { PlanDetail } from '@shared/schemas/plan-views';
import { planKeys } from './keys';

/** The plan with what it says about its station (pinned version, changes since approval, notices). */
export function getPlan(id: number): Promise<PlanDetail> {
  return api.get(`/plans/${id}`);
}

export const getPlanQueryOptions = (id: number) =>
  queryOptions({ queryKey: planKeys.detail(id), queryFn: () => getPlan(id) });
