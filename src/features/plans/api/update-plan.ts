import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdatePlanInput } from '@shared/schemas/plan';
import { api } from '@/lib/api-client';
import type { PlanView } from '../types';
import { planKeys } from './keys';

export function updatePlan({
  id,
  data,
  keepalive,
}: {
  id: number;
  data: UpdatePlanInput;
  /** sent as the page is left: the request outlives it */
  keepalive?: boolean;
}): Promise<PlanView> {
  return api.patch(`/plans/${id}`, data, keepalive ? { keepalive } : undefined);
}

/** The saved plan replaces the cached one at once, so the next save carries its new version. */
export function useUpdatePlan({ onSuccess }: { onSuccess?: (plan: PlanView) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updatePlan,
    onSuccess: (plan) => {
      queryClient.setQueryData(planKeys.detail(plan.id), plan);
      void queryClient.invalidateQueries({ queryKey: planKeys.timeline(plan.id) });
      void queryClient.invalidateQueries({ queryKey: planKeys.lists() });
      onSuccess?.(plan);
    },
  });
}
