import { useMutation } from '@tanstack/react-query';
import type { PlanSequence } from '@shared/schemas/sequence';
import { api } from '@/lib/api-client';

/** The server's proposed order of the saved plan's tasks (nothing is saved). */
export function suggestOrder(id: number): Promise<PlanSequence> {
  return api.post(`/plans/${id}/sequence`, {});
}

export const useSuggestOrder = () => useMutation({ mutationFn: suggestOrder });
