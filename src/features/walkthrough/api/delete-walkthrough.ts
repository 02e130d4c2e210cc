import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { walkthroughKeys } from './keys';

export function deleteWalkthrough({ id, version }: { id: number; version: number }): Promise<void> {
  return api.delete(`/walkthroughs/${id}?version=${version}`);
}

export function useDeleteWalkthrough({ onSuccess }: { onSuccess?: (id: number) => void } = {}) {
  return useInvalidatingMutation({
    mutationFn: deleteWalkthrough,
    invalidates: [walkthroughKeys.all],
    onSuccess: (_, { id }) => onSuccess?.(id),
  });
}
