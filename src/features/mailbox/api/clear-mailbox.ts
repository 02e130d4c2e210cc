import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { mailboxKeys } from './keys';

export function clearMailbox(): Promise<void> {
  return api.delete('/mailbox');
}

export function useClearMailbox({ onSuccess }: { onSuccess?: () => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: clearMailbox,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: mailboxKeys.lists() });
      onSuccess?.();
    },
  });
}
