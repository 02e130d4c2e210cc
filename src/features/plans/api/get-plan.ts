import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { PlanView } from '../types';
import { planKeys } from './keys';

export function getPlan(id: number): Promise<PlanView> {
  return api.get(`/plans/${id}`);
}

export const getPlanQueryOptions = (id: number) =>
  queryOptions({ queryKey: planKeys.detail(id), queryFn: () => getPlan(id) });
