import type { UpdateUserInput, UserAdminView } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { userKeys } from './keys';

export function updateUser({
  id,
  data,
}: {
  id: number;
  data: UpdateUserInput;
}): Promise<{ user: UserAdminView }> {
  return api.patch(`/users/${id}`, data);
}

export function useUpdateUser({ onSuccess }: { onSuccess?: (user: UserAdminView) => void } = {}) {
  return useInvalidatingMutation({
    mutationFn: updateUser,
    invalidates: [userKeys.lists()],
    onSuccess: ({ user }) => onSuccess?.(user),
  });
}
