import type { InviteUserInput, UserAdminView } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { userKeys } from './keys';

export function inviteUser(input: InviteUserInput): Promise<{ user: UserAdminView }> {
  return api.post('/users/invite', input);
}

export function useInviteUser({ onSuccess }: { onSuccess?: (user: UserAdminView) => void } = {}) {
  return useInvalidatingMutation({
    mutationFn: inviteUser,
    invalidates: [userKeys.lists()],
    onSuccess: ({ user }) => onSuccess?.(user),
  });
}
