import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { userKeys } from './keys';

export function resendInvite(id: number): Promise<void> {
  return api.post(`/users/${id}/resend-invite`);
}

export function useResendInvite({ onSuccess }: { onSuccess?: (id: number) => void } = {}) {
  return useInvalidatingMutation({
    mutationFn: resendInvite,
    invalidates: [userKeys.lists()],
    onSuccess: (_, id) => onSuccess?.(id),
  });
}
