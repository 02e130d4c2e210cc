import type { CreatePlanInput } from '@shared/schemas/plan';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import type { PlanView } from '../types';
import { planKeys } from './keys';

export function createPlan(input: CreatePlanInput): Promise<PlanView> {
  return api.post('/plans', input);
}

export function useCreatePlan({ onSuccess }: { onSuccess?: (plan: PlanView) => void } = {}) {
  return useInvalidatingMutation({
    mutationFn: createPlan,
    invalidates: [planKeys.lists()],
    onSuccess,
  });
}
