import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { PlanView } from '../types';
import { planKeys } from './keys';

export type ReviewStep = 'submit' | 'approve' | 'return';

export interface ReviewPlanInput {
  id: number;
  step: ReviewStep;
  version: number;
  comment?: string;
}

export function reviewPlan({ id, step, version, comment }: ReviewPlanInput): Promise<PlanView> {
  return api.post(`/plans/${id}/${step}`, { version, ...(comment ? { comment } : {}) });
}

export function useReviewPlan({
  onSuccess,
}: { onSuccess?: (plan: PlanView, step: ReviewStep) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: reviewPlan,
    onSuccess: (plan, { step }) => {
      queryClient.setQueryData(planKeys.detail(plan.id), plan);
      void queryClient.invalidateQueries({ queryKey: planKeys.timeline(plan.id) });
      void queryClient.invalidateQueries({ queryKey: planKeys.lists() });
      onSuccess?.(plan, step);
    },
  });
}
