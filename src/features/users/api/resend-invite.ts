import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { userKeys } from './keys';

export function resendInvite(id: number): Promise<void> {
  return api.post(`/users/${id}/resend-invite`);
}

export function useResendInvite({ onSuccess }: { onSuccess?: (id: number) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: resendInvite,
    onSuccess: (_, id) => {
      void queryClient.invalidateQueries({ queryKey: userKeys.lists() });
      onSuccess?.(id);
    },
  });
}
