import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { InviteUserInput, UserAdminView } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { userKeys } from './keys';

export function inviteUser(input: InviteUserInput): Promise<{ user: UserAdminView }> {
  return api.post('/users/invite', input);
}

export function useInviteUser({ onSuccess }: { onSuccess?: (user: UserAdminView) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: inviteUser,
    onSuccess: ({ user }) => {
      void queryClient.invalidateQueries({ queryKey: userKeys.lists() });
      onSuccess?.(user);
    },
  });
}
