import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { mailboxKeys } from './keys';

export function clearMailbox(): Promise<void> {
  return api.delete('/mailbox');
}

export function useClearMailbox({ onSuccess }: { onSuccess?: () => void } = {}) {
  return useInvalidatingMutation({
    mutationFn: clearMailbox,
    invalidates: [mailboxKeys.lists()],
    onSuccess: () => onSuccess?.(),
  });
}
