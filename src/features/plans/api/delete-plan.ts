import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import type { PlanView } from '../types';
import { planKeys } from './keys';

/** Deletes a draft plan at the version on screen (a stale one is refused). */
export function deletePlan({ id, version }: { id: number; version: number }): Promise<void> {
  return api.delete(`/plans/${id}?version=${version}`);
}

export function useDeletePlan({ onSuccess }: { onSuccess?: () => void } = {}) {
  return useInvalidatingMutation({
    mutationFn: deletePlan,
    invalidates: [planKeys.lists(), ['series']],
    onSuccess,
  });
}

/** A new draft with the plan's tasks, manifest, crew and settings, written by whoever asks. */
export function duplicatePlan({ id, title }: { id: number; title?: string }): Promise<PlanView> {
  return api.post(`/plans/${id}/duplicate`, title ? { title } : {});
}

export function useDuplicatePlan({ onSuccess }: { onSuccess?: (plan: PlanView) => void } = {}) {
  return useInvalidatingMutation({
    mutationFn: duplicatePlan,
    invalidates: [planKeys.lists()],
    onSuccess,
  });
}
